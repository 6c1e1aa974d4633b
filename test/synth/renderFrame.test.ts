import { describe, expect, it } from 'vitest';
import { renderFrame } from '../../src/synth/renderFrame.js';
import { resolveSynthSpec } from '../../src/synth/SynthSpec.js';
import type { SynthSpec, SynthSpecInput } from '../../src/synth/SynthSpec.js';

/**
 * Plain intensity-weighted centroid over a square window (image moments m10/m00, m01/m00 — common practice,
 * no source), weights = |pixel − background level|. Pixel centres at integer coordinates.
 */
function centroid(data: Uint8Array, width: number, channels: number, channel: number, cx: number, cy: number, half: number, background: number): { x: number; y: number } {
  let m00 = 0, m10 = 0, m01 = 0;
  for (let y = Math.round(cy) - half; y <= Math.round(cy) + half; y++) {
    for (let x = Math.round(cx) - half; x <= Math.round(cx) + half; x++) {
      const w = Math.abs(data[(y * width + x) * channels + channel] - background);
      m00 += w; m10 += w * x; m01 += w * y;
    }
  }
  return { x: m10 / m00, y: m01 / m00 };
}

function spec(input: SynthSpecInput): SynthSpec {
  return resolveSynthSpec(input);
}

// Truth: the marker positions and angles the renderer reports for each frame (our renderer, known by
// construction), checked against the pixels it draws with the centroid above, written here, and against
// closed forms worked by hand.
describe('renderFrame, lossless pixels against truth', () => {
  it('puts each marker centroid within 0.05 px of the truth at radius ≥ 80 px, for bright, dark and colour markers', () => {
    const s = spec({
      width_px: 320, height_px: 240,
      hub: { radius_px: 112 },
      markers: [{ radius_px: 80, size_px: 4, kind: 'bright' }, { radius_px: 95, phase_deg: 120, size_px: 3, kind: 'dark' }, { radius_px: 88, phase_deg: 240, size_px: 5, kind: 'color', rgb: [230, 30, 40] }],
      profile: { kind: 'steady', rate_deg_s: 37.3 },
    });
    let worst = 0;
    for (let f = 0; f < 40; f++) {
      const frame = renderFrame(s, f / 30, f);
      frame.markers.forEach((m, i) => {
        const c = centroid(frame.data, 320, 3, i === 2 ? 0 : 1, m.x_px, m.y_px, 9, 110);
        worst = Math.max(worst, Math.hypot(c.x - m.x_px, c.y - m.y_px));
      });
    }
    expect(worst).toBeLessThan(0.05);
  });

  it('shows sub-pixel motion: centroid steps follow truth steps of about 0.05 px per frame', () => {
    // 0.036 deg/s at 80 px radius and 30 fps moves the marker 0.0017 px… use 1.0 deg/s: 80·π/180/30 ≈ 0.047 px per frame
    const s = spec({ markers: [{ radius_px: 80 }], profile: { kind: 'steady', rate_deg_s: 1, angle0_deg: 33 } });
    const first = renderFrame(s, 0, 0);
    const c0 = centroid(first.data, 320, 1, 0, first.markers[0].x_px, first.markers[0].y_px, 8, 110);
    for (const f of [1, 3, 10]) {
      const frame = renderFrame(s, f / 30, f);
      expect(frame.data).not.toEqual(first.data);
      const c = centroid(frame.data, 320, 1, 0, first.markers[0].x_px, first.markers[0].y_px, 8, 110);
      const truthStep = Math.hypot(frame.markers[0].x_px - first.markers[0].x_px, frame.markers[0].y_px - first.markers[0].y_px);
      expect(Math.abs(Math.hypot(c.x - c0.x, c.y - c0.y) - truthStep)).toBeLessThan(0.01);
    }
  });

  it('places the marker at the rotor angle, counterclockwise as seen (image y down)', () => {
    // by hand: 90 deg/s for 1 s is 90°, plus the marker's 10° phase = 100° (uniform rotation, common practice, no source)
    const s = spec({ markers: [{ radius_px: 80, phase_deg: 10 }], profile: { kind: 'steady', rate_deg_s: 90 } });
    const frame = renderFrame(s, 1, 30);
    expect(frame.angle_deg).toBeCloseTo(90, 9);
    const { x_px, y_px } = frame.markers[0];
    expect((Math.atan2(-(y_px - 120), x_px - 160) * 180) / Math.PI).toBeCloseTo(100, 9);
    const c = centroid(frame.data, 320, 1, 0, x_px, y_px, 8, 110);
    expect(c.y).toBeLessThan(120 - 70); // above the centre in the picture
  });
});

describe('renderFrame, realism effects', () => {
  it('is deterministic for a seed; noise changes with seed and frame index and has the given spread', () => {
    const s = spec({ seed: 11, realism: { noise_sigma: 4 } });
    const a = renderFrame(s, 0.5, 15);
    expect(renderFrame(spec({ seed: 11, realism: { noise_sigma: 4 } }), 0.5, 15).data).toEqual(a.data);
    expect(renderFrame(s, 0.5, 16).data).not.toEqual(a.data);
    expect(renderFrame(spec({ seed: 12, realism: { noise_sigma: 4 } }), 0.5, 15).data).not.toEqual(a.data);
    const clean = renderFrame(spec({ seed: 11 }), 0.5, 15);
    let sum = 0, sum2 = 0;
    for (let i = 0; i < a.data.length; i++) {
      const d = a.data[i] - clean.data[i];
      sum += d; sum2 += d * d;
    }
    const n = a.data.length;
    const sd = Math.sqrt((sum2 - (sum * sum) / n) / (n - 1));
    // rounding to whole levels adds 1/12 level² of variance (uniform quantisation noise, common practice, no
    // source): √(16 + 1/12) ≈ 4.01
    expect(sd).toBeGreaterThan(3.9);
    expect(sd).toBeLessThan(4.15);
  });

  it('is deterministic with every effect on: separately resolved specs give the same bytes and truth', () => {
    const input: SynthSpecInput = {
      seed: 77, markers: [{ radius_px: 80 }, { radius_px: 60, phase_deg: 90, kind: 'dark' }],
      profile: { kind: 'sequence' },
      realism: { noise_sigma: 3, exposure_s: 0.01, flicker: { amplitude: 0.1 }, shake: { translation_px: 2, rotation_deg: 0.3 }, oblique: { tilt_deg: 30, axis_deg: 10 }, particles: { share: 0.3 }, hub_texture: true, timing: { jitter_s: 0.005 } },
    };
    for (const f of [3, 20, 41]) {
      const a = renderFrame(spec(input), f / 30, f);
      const b = renderFrame(spec(JSON.parse(JSON.stringify(input))), f / 30, f);
      expect(b.data).toEqual(a.data);
      expect(b.markers).toEqual(a.markers);
      expect(b.shake).toEqual(a.shake);
    }
    const other = renderFrame(spec({ ...input, seed: 78 }), 20 / 30, 20);
    expect(other.shake).not.toEqual(renderFrame(spec(input), 20 / 30, 20).shake);
  });

  it('oblique view: markers lie on an ellipse with axis ratio cos(tilt), and the pixels agree with the truth', () => {
    const tilt = 50, axis = 30;
    const s = spec({ hub: { radius_px: 110 }, markers: [{ radius_px: 90, size_px: 5 }], profile: { kind: 'steady', rate_deg_s: 45 }, realism: { oblique: { tilt_deg: tilt, axis_deg: axis } } });
    const a = (axis * Math.PI) / 180;
    let worst = 0;
    for (let f = 0; f < 240; f += 7) {
      const frame = renderFrame(s, f / 30, f);
      const { x_px, y_px } = frame.markers[0];
      const X = x_px - 160, Y = -(y_px - 120);
      const along = X * Math.cos(a) + Y * Math.sin(a);
      const across = -X * Math.sin(a) + Y * Math.cos(a);
      // ellipse with semi-axes r (along the tilt axis) and r·cos(tilt) (across it): orthographic projection of a
      // circle (common practice, no source)
      expect((along / 90) ** 2 + (across / (90 * Math.cos((tilt * Math.PI) / 180))) ** 2).toBeCloseTo(1, 9);
      // the own-plane angle: undo the foreshortening
      const own = (Math.atan2(across / Math.cos((tilt * Math.PI) / 180), along) * 180) / Math.PI + axis;
      const d = ((own - frame.angle_deg) % 360 + 540) % 360 - 180;
      expect(Math.abs(d)).toBeLessThan(1e-9);
      const c = centroid(frame.data, 320, 1, 0, x_px, y_px, 9, 110);
      worst = Math.max(worst, Math.hypot(c.x - x_px, c.y - y_px));
    }
    expect(worst).toBeLessThan(0.05);
  });

  it('motion blur: the smeared marker centroid sits on the arc centroid r·sin(α)/α at the mid-exposure angle', () => {
    // a 24° sweep during the exposure (720 deg/s × 1/30 s); centroid of a circular arc of half-angle α lies at
    // r·sin(α)/α from the centre (Meriam & Kraige, Engineering Mechanics: Statics, Table D/3, from memory)
    const s = spec({ hub: { radius_px: 118 }, markers: [{ radius_px: 80, size_px: 4 }], fps: 30, profile: { kind: 'steady', rate_deg_s: 720, angle0_deg: 5 }, realism: { exposure_s: 1 / 30 } });
    const frame = renderFrame(s, 0.2, 6);
    const { x_px, y_px } = frame.markers[0];
    const c = centroid(frame.data, 320, 1, 0, x_px, y_px, 22, 110);
    const alpha = ((24 / 2) * Math.PI) / 180;
    const expectedR = (80 * Math.sin(alpha)) / alpha; // 79.42 px, 0.58 px inside the marker circle
    expect(Math.abs(Math.hypot(c.x - 160, c.y - 120) - expectedR)).toBeLessThan(0.05);
    const angle = (Math.atan2(-(c.y - 120), c.x - 160) * 180) / Math.PI;
    // mid-exposure angle by hand: θ0 + ωt = 5 + 720 × 0.2 = 149° (uniform rotation, common practice, no source)
    expect(angle).toBeCloseTo(149, 1);
  });

  it('flicker: the global gain follows 1 + A·sin(2πft + φ)', () => {
    const base = { markers: [{ radius_px: 80 }], profile: { kind: 'steady' as const, rate_deg_s: 0 } };
    const s = spec({ ...base, realism: { flicker: { amplitude: 0.2, frequency_hz: 2 } } });
    const clean = renderFrame(spec(base), 0, 0).data;
    const gain = (t: number): number => {
      const d = renderFrame(s, t, 0).data;
      let a = 0, b = 0;
      for (let i = 0; i < d.length; i++) { a += d[i]; b += clean[i]; }
      return a / b;
    };
    // a quarter period apart, (g1 − 1)² + (g2 − 1)² = A² for a sinusoid
    for (const t of [0.1, 0.37]) {
      const g1 = gain(t), g2 = gain(t + 1 / 8);
      expect(Math.hypot(g1 - 1, g2 - 1)).toBeCloseTo(0.2, 2);
    }
  });

  it('camera shake moves the whole picture, fiducial included, and the truth follows it', () => {
    const scene = { markers: [{ radius_px: 80 }], background: { fiducial: { x_px: 20, y_px: 20, size_px: 24 } }, profile: { kind: 'steady' as const, rate_deg_s: 20 } };
    const s = spec({ ...scene, realism: { shake: { translation_px: 3, rotation_deg: 0.5 } } });
    const still = spec(scene);
    const fid = s.background.fiducial!;
    const fidCentre = { x: fid.x_px + (fid.size_px - 1) / 2, y: fid.y_px + (fid.size_px - 1) / 2 };
    let moved = 0;
    for (const f of [5, 20, 45]) {
      const a = renderFrame(s, f / 30, f);
      const b = renderFrame(still, f / 30, f);
      const { dx_px, dy_px, rotation_deg } = a.shake;
      const r = (rotation_deg * Math.PI) / 180;
      const ox = (320 - 1) / 2, oy = (240 - 1) / 2;
      // where the fiducial centre should go: rotation about the frame centre (CCW as seen), then translation
      const ex = ox + Math.cos(r) * (fidCentre.x - ox) + Math.sin(r) * (fidCentre.y - oy) + dx_px;
      const ey = oy - Math.sin(r) * (fidCentre.x - ox) + Math.cos(r) * (fidCentre.y - oy) + dy_px;
      const c = centroid(a.data, 320, 1, 0, ex, ey, fid.size_px / 2 + 2, 60);
      const c0 = centroid(b.data, 320, 1, 0, fidCentre.x, fidCentre.y, fid.size_px / 2 + 2, 60);
      expect(Math.hypot(c.x - (ex + c0.x - fidCentre.x), c.y - (ey + c0.y - fidCentre.y))).toBeLessThan(0.15);
      const m = a.markers[0];
      const cm = centroid(a.data, 320, 1, 0, m.x_px, m.y_px, 8, 110);
      expect(Math.hypot(cm.x - m.x_px, cm.y - m.y_px)).toBeLessThan(0.05);
      moved = Math.max(moved, Math.hypot(m.x_px - b.markers[0].x_px, m.y_px - b.markers[0].y_px));
    }
    expect(moved).toBeGreaterThan(0.5);
  });

  it('particles: about the given share of frames is flagged, and the flag matches the pixels', () => {
    const base = { seed: 3, fps: 30, duration_s: 3, markers: [{ radius_px: 80, size_px: 4 }], profile: { kind: 'steady' as const, rate_deg_s: 60 } };
    const s = spec({ ...base, realism: { particles: { share: 0.25, size_px: 5, level: 30 } } });
    const clear = spec(base);
    let flagged = 0, flaggedChanged = 0, insideHits = 0;
    for (let f = 0; f < 90; f++) {
      const a = renderFrame(s, f / 30, f);
      const b = renderFrame(clear, f / 30, f);
      const m = a.markers[0];
      // pixels whose centre is within size − 1 of the marker centre lie wholly inside the marker
      let insideChanged = false, nearChanged = false;
      for (let y = Math.floor(m.y_px) - 6; y <= Math.ceil(m.y_px) + 6; y++) {
        for (let x = Math.floor(m.x_px) - 6; x <= Math.ceil(m.x_px) + 6; x++) {
          const d = Math.hypot(x - m.x_px, y - m.y_px);
          const changed = a.data[y * 320 + x] !== b.data[y * 320 + x];
          if (d <= 3 && changed) insideChanged = true;
          if (d <= 4 + 0.71 && changed) nearChanged = true;
        }
      }
      if (insideChanged) { insideHits++; expect(m.occluded).toBe(true); }
      if (m.occluded) { flagged++; if (nearChanged) flaggedChanged++; }
    }
    expect(flagged / 90).toBeGreaterThan(0.2);
    expect(flagged / 90).toBeLessThan(0.4);
    expect(flaggedChanged / flagged).toBeGreaterThan(0.9);
    // the inside-the-marker check above really ran on some frames
    expect(insideHits).toBeGreaterThan(0);
  });

  it('hub texture without a marker turns with the rotor', () => {
    const s = spec({ markers: [], hub: { radius_px: 100 }, profile: { kind: 'steady', rate_deg_s: 30 }, realism: { hub_texture: true } });
    const a = renderFrame(s, 0, 0);
    const b = renderFrame(s, 1, 30); // turned 30° CCW
    expect(a.markers).toEqual([]);
    // bilinear sample of frame b at the point that frame a's pixel moves to after turning by θ
    const sample = (d: Uint8Array, x: number, y: number): number => {
      const x0 = Math.floor(x), y0 = Math.floor(y), fx = x - x0, fy = y - y0;
      const at = (i: number, j: number): number => d[j * 320 + i];
      return (at(x0, y0) * (1 - fx) + at(x0 + 1, y0) * fx) * (1 - fy) + (at(x0, y0 + 1) * (1 - fx) + at(x0 + 1, y0 + 1) * fx) * fy;
    };
    const mismatch = (turn_deg: number): number => {
      const r = (turn_deg * Math.PI) / 180;
      let sum = 0, n = 0;
      for (let y = 40; y <= 200; y += 3) {
        for (let x = 80; x <= 240; x += 3) {
          const X = x - 160, Y = -(y - 120);
          if (Math.hypot(X, Y) > 85) continue;
          const xr = 160 + X * Math.cos(r) - Y * Math.sin(r);
          const yr = 120 - (X * Math.sin(r) + Y * Math.cos(r));
          sum += Math.abs(sample(b.data, xr, yr) - a.data[y * 320 + x]);
          n++;
        }
      }
      return sum / n;
    };
    expect(mismatch(30)).toBeLessThan(1.5);
    expect(mismatch(-30)).toBeGreaterThan(5 * mismatch(30));
  });

  it('renders a colour marker in RGB mode with its own colour', () => {
    const s = spec({ markers: [{ radius_px: 80, size_px: 5, kind: 'color', rgb: [200, 40, 90] }] });
    const frame = renderFrame(s, 0.3, 9);
    expect(frame.data).toHaveLength(320 * 240 * 3);
    const { x_px, y_px } = frame.markers[0];
    const p = (Math.round(y_px) * 320 + Math.round(x_px)) * 3;
    expect(Array.from(frame.data.subarray(p, p + 3))).toEqual([200, 40, 90]);
  });
});
