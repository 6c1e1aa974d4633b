// A given --center that is not where the marker's path is centred: track says so instead of silently turning
// the error into a false tilt. Truth: the synthetic renderer's hub centre (src/synth), 160,120 in its default
// 320×240 layout; the tracker never sees it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import { trackVideo } from '../../src/track/trackVideo.js';

let dir: string;
let video: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-centrecheck-'));
  // one and a half turns in 1.5 s at 30 fps: enough of the circle for the path to locate its own centre
  const clip = await renderClip({ seed: 4, duration_s: 1.5, fps: 30, profile: { kind: 'steady', rate_deg_s: 360 }, realism: { noise_sigma: 2 } }, join(dir, 'c.mp4'));
  expect(clip.spec.hub.cx_px).toBe(160);
  expect(clip.spec.hub.cy_px).toBe(120);
  video = clip.videoPath;
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const offCentre = (w: string[]) => w.filter((x) => x.startsWith("The marker's path is centred near"));

describe('a given --center', () => {
  it('passes without comment when it is the true centre', async () => {
    const r = await trackVideo(video, { centre: { x_px: 160, y_px: 120 } });
    expect(offCentre(r.summary.warnings)).toEqual([]);
  });

  it('draws a warning naming where the path is centred when it is 20 px off', async () => {
    const r = await trackVideo(video, { centre: { x_px: 180, y_px: 120 } });
    const w = offCentre(r.summary.warnings);
    expect(w).toHaveLength(1);
    const m = /centred near ([\d.]+),([\d.]+) px, ([\d.]+) px from --center 180,120/.exec(w[0]!)!;
    expect(Number(m[1])).toBeCloseTo(160, 0);
    expect(Number(m[2])).toBeCloseTo(120, 0);
    expect(Number(m[3])).toBeCloseTo(20, 0);
  });
});
