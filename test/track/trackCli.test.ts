import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { renderClip } from '../../src/synth/renderClip.js';

// Spawns the built CLI (run `npm run build` first). Truth: the synthetic renderer's per-frame angles.
const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
let dir: string;
let video: string;
let truth: Float64Array;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-trackcli-'));
  const clip = await renderClip({ seed: 4, duration_s: 1.5, profile: { kind: 'steady', rate_deg_s: 300 }, realism: { noise_sigma: 2 } }, join(dir, 'run.mp4'));
  video = clip.videoPath;
  truth = clip.truth.angle_deg;
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('revtrace track', () => {
  it('writes angle.csv (one row per frame, the documented columns), track.json and preview.png', async () => {
    const out = join(dir, 'out');
    const r = spawnSync(process.execPath, [bin, 'track', video, '--out', out, '--roi', '40,10,240,220', '--quiet'], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const rows = (await readFile(join(out, 'angle.csv'), 'utf8')).trim().split('\n');
    expect(rows[0]).toBe('frame,t_s,x_px,y_px,angle_deg,quality,flag');
    expect(rows.length - 1).toBe(truth.length);
    const angle = rows.slice(1).map((l) => Number(l.split(',')[4]));
    // counterclockwise positive: the angle grows by the true amount over the run
    expect(angle[angle.length - 1] - angle[0]).toBeCloseTo(truth[truth.length - 1] - truth[0], 0);
    const summary = JSON.parse(await readFile(join(out, 'track.json'), 'utf8'));
    expect(summary.centre.source).toBe('ellipse-fit');
    expect((await stat(join(out, 'preview.png'))).size).toBeGreaterThan(1000);
  });

  it('exits 2 with one sentence naming the option for bad input, and writes nothing', async () => {
    const out = join(dir, 'bad');
    for (const [args, pattern] of [
      [['--roi', '300,10,100,100'], /^revtrace: --roi 300,10,100,100 lies outside the 320×240 frame; give x,y,w,h inside it\n$/],
      [['--roi', '40,10,240,220', '--center', '5,5'], /^revtrace: --center 5,5 lies outside --roi/],
      [['--marker', 'color:#00ff00'], /^revtrace: no pixel in the whole 320×240 frame \(no --roi given\) comes within .*color:00ff00/],
      [['--tilt', 'steep'], /^revtrace: --tilt "steep" is not a number/],
    ] as const) {
      const r = spawnSync(process.execPath, [bin, 'track', video, '--out', out, ...args], { encoding: 'utf8' });
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(pattern);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    }
    await expect(stat(out)).rejects.toThrow();
  });
});
