import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { resolveSynthSpec } from '../../src/synth/SynthSpec.js';
import type { SynthSpecInput } from '../../src/synth/SynthSpec.js';

/** Resolves and returns the InputError message, failing if it does not throw one. */
function messageFor(input: unknown): string {
  try {
    resolveSynthSpec(input as SynthSpecInput);
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return (err as Error).message;
  }
  throw new Error(`expected ${JSON.stringify(input)} to be rejected`);
}

describe('resolveSynthSpec', () => {
  // the defaults are design choices, checked against the README's synth option table (size, fps, duration, seed,
  // rate 90 deg/s, flicker 3 Hz, shake 4 Hz, particle size 5 px and speed 60 px/s; every effect off)
  it('fills defaults with every realism effect off', () => {
    const s = resolveSynthSpec({});
    expect(s).toMatchObject({ seed: 1, width_px: 320, height_px: 240, fps: 30, duration_s: 2, channels: 1 });
    expect(s.markers).toHaveLength(1);
    expect(s.profile).toEqual({ kind: 'steady', angle0_deg: 0, rate_deg_s: 90 });
    expect(s.realism).toEqual({
      noise_sigma: 0,
      exposure_s: 0,
      crf: null,
      flicker: { amplitude: 0, frequency_hz: 3 },
      shake: { translation_px: 0, rotation_deg: 0, bandwidth_hz: 4 },
      oblique: { tilt_deg: 0, axis_deg: 0 },
      particles: { share: 0, size_px: 5, speed_px_s: 60, level: 200 },
      hub_texture: false,
      timing: { jitter_s: 0, dropped_frames: [] },
    });
    expect(s.background.fiducial).not.toBeNull();
  });

  it('is idempotent and survives a JSON round trip', () => {
    const s = resolveSynthSpec({ seed: 9, markers: [{ kind: 'color', radius_px: 85 }, { kind: 'dark', phase_deg: 180 }], profile: { kind: 'sequence' }, realism: { timing: { dropped_frames: [7, 3] } } });
    expect(s.channels).toBe(3);
    expect(s.realism.timing.dropped_frames).toEqual([3, 7]);
    expect(resolveSynthSpec(s)).toEqual(s);
    expect(resolveSynthSpec(JSON.parse(JSON.stringify(s)))).toEqual(s);
  });

  it('rejects bad options with one sentence naming the field', () => {
    const cases: Array<[unknown, RegExp]> = [
      [{ width_px: 321 }, /odd side/],
      [{ fps: 0 }, /fps/],
      [{ duration_s: -1 }, /duration_s/],
      [{ seed: 1.5 }, /seed/],
      [{ markers: [{ radius_px: 500 }] }, /markers\[0\]/],
      [{ markers: [{ kind: 'striped' }] }, /kind/],
      [{ markers: [{ kind: 'color' }], channels: 1 }, /channels/],
      [{ markers: [] }, /nothing visible turns/],
      [{ profile: { kind: 'wobble' } }, /profile kind/],
      [{ profile: { kind: 'spinup', tau_s: 0 } }, /tau_s/],
      [{ profile: { kind: 'coastdown', coulomb_deg_s2: 0, viscous_per_s: 0 } }, /friction/],
      [{ profile: { kind: 'sequence', phases: [{ kind: 'steady' }, { kind: 'rest' }] } }, /rest/],
      [{ realism: { exposure_s: 0.1 } }, /exposure_s/],
      [{ realism: { crf: 60 } }, /crf/],
      [{ realism: { oblique: { tilt_deg: 90 } } }, /tilt_deg/],
      [{ realism: { particles: { share: 1 } } }, /share/],
      [{ realism: { timing: { jitter_s: 0.02 } } }, /jitter_s/],
      [{ realism: { timing: { dropped_frames: [0] } } }, /dropped_frames/],
      [{ realism: { timing: { dropped_frames: [4, 4] } } }, /twice/],
      [{ realism: { blurr: 1 } }, /unknown field "blurr"/],
      ['not an object', /JSON object/],
    ];
    for (const [input, pattern] of cases) {
      const message = messageFor(input);
      expect(message).toMatch(pattern);
      expect(message).not.toMatch(/\n/);
      // one sentence: no full stop followed by another sentence
      expect(message).not.toMatch(/\.\s+[A-Z]/);
    }
  });

  it('shows a range bound a person can type back: six digits, rounded inwards (30 fps: exposure at most 1/30 s)', () => {
    const message = messageFor({ fps: 30, realism: { exposure_s: 0.04 } });
    expect(message).toBe('synth realism.exposure_s is 0.04, outside 0–0.0333333; give a value in that range');
    expect(() => resolveSynthSpec({ fps: 30, realism: { exposure_s: 0.0333333 } })).not.toThrow();
    expect(messageFor({ fps: 0 })).toBe('synth fps is 0, outside 1–1000; give a value in that range'); // exact bounds stay as they are
  });
});
