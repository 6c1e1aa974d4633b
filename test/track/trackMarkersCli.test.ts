import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtemp, readFile, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

// Spawns the built CLI (run `npm run build` first). Truth: the synthetic renderer's truth.csv, written by
// `revtrace synth` beside the clip (the rotor's true angle per frame); the tracker never reads it.
const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
let dir: string;
let video: string;
const run = (args: string[]) => spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8' });

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-markerscli-'));
  video = join(dir, 'two.mp4');
  const r = run(['synth', '--out', video, '--seed', '6', '--rate', '-45', '--duration', '2.7', '--noise', '2', '--marker', '80,20,4', '--marker', '60,200,4', '--quiet']);
  expect(r.status, r.stderr).toBe(0);
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('revtrace track --markers', () => {
  it('follows two markers of a slow run (about 120° each) without --center; angle.csv keeps its columns', async () => {
    const one = run(['track', video, '--out', join(dir, 'one'), '--roi', '40,10,240,220', '--quiet']);
    expect(one.status).toBe(2);
    expect(one.stderr).toMatch(/^revtrace: the marker swept only 1\d\d° of its circle, too little to fit the centre and view; give --center x,y/);
    const out = join(dir, 'out');
    const r = run(['track', video, '--out', out, '--roi', '40,10,240,220', '--markers', '2', '--quiet']);
    expect(r.status, r.stderr).toBe(0);
    const rows = (await readFile(join(out, 'angle.csv'), 'utf8')).trim().split('\n');
    expect(rows[0]).toBe('frame,t_s,x_px,y_px,angle_deg,quality,flag');
    const truthRows = (await readFile(join(dir, 'two.truth.csv'), 'utf8')).trim().split('\n');
    const col = truthRows[0].split(',').indexOf('angle_deg');
    const truth = truthRows.slice(1).map((l) => Number(l.split(',')[col]));
    expect(rows.length - 1).toBe(truth.length);
    const angle = rows.slice(1).map((l) => Number(l.split(',')[4]));
    // clockwise as displayed: the angle falls by the renderer's amount (45 deg/s × 2.7 s ≈ 121°)
    expect(angle[angle.length - 1] - angle[0]).toBeCloseTo(truth[truth.length - 1] - truth[0], 0);
    const summary = JSON.parse(await readFile(join(out, 'track.json'), 'utf8'));
    expect(summary.centre.source).toBe('ellipse-fit');
    // the renderer's default hub centre is the middle of the 320×240 frame
    expect(Math.abs(summary.centre.x_px.value - 160)).toBeLessThan(0.5);
    expect(Math.abs(summary.centre.y_px.value - 120)).toBeLessThan(0.5);
    expect(summary.settings.markers).toBe(2);
    expect(summary.markers.count).toBe(2);
    expect(summary.markers.found_frames).toEqual([truth.length, truth.length]);
    expect(Math.abs(Math.abs(summary.markers.phase_offset_deg[1]) - 180)).toBeLessThan(0.5);
    expect((await stat(join(out, 'preview.png'))).size).toBeGreaterThan(1000);
  });

  it('--markers 1 writes the same files as no --markers at all', async () => {
    const a = join(dir, 'plain');
    const b = join(dir, 'single');
    const args = ['--roi', '40,10,240,220', '--center', '160,120', '--quiet'];
    expect(run(['track', video, '--out', a, ...args]).status).toBe(0);
    expect(run(['track', video, '--out', b, ...args, '--markers', '1']).status).toBe(0);
    for (const f of ['angle.csv', 'track.json', 'preview.png']) expect((await readFile(join(b, f))).equals(await readFile(join(a, f))), f).toBe(true);
  });

  it('exits 2 with one sentence for a bad count', () => {
    for (const [value, pattern] of [
      ['two', /^revtrace: --markers "two" must be a whole number of marker spots from 1 to 8\n$/],
      ['0', /^revtrace: --markers "0" must be a whole number/],
    ] as const) {
      const r = run(['track', video, '--out', join(dir, 'bad'), '--markers', value]);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(pattern);
    }
  });
});
