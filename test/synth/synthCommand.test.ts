import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const bin = fileURLToPath(new URL('../../bin/revtrace', import.meta.url));
const run = (args: string[], cwd: string) => spawnSync(process.execPath, [bin, ...args], { encoding: 'utf8', cwd });

describe('revtrace synth (needs npm run build)', () => {
  it('renders a clip with truth and spec, and --spec of the sidecar reproduces it exactly', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-synth-cli-'));
    try {
      const r = run(['synth', '--out', 'a.mp4', '--size', '160x120', '--duration', '0.5', '--rate', '-20', '--tilt', '30,15', '--jitter', '0.004', '--drop', '3', '--marker', '40,0,3,dark', '--seed', '8'], dir);
      expect(r.stderr).toBe('');
      expect(r.status).toBe(0);
      expect(r.stdout).toMatch(/anchor region \d+,\d+,\d+,\d+/);
      const sidecar = JSON.parse(await readFile(join(dir, 'a.synth.json'), 'utf8'));
      expect(sidecar.spec.profile).toEqual({ kind: 'steady', angle0_deg: 0, rate_deg_s: -20 });
      expect(sidecar.spec.realism.oblique).toEqual({ tilt_deg: 30, axis_deg: 15 });
      expect(sidecar.spec.markers[0]).toMatchObject({ radius_px: 40, size_px: 3, kind: 'dark' });
      const truth = await readFile(join(dir, 'a.truth.csv'), 'utf8');
      expect(truth.trim().split('\n')).toHaveLength(1 + 14); // header + 0.5 s × 30 fps = 15 frames, one dropped

      const again = run(['synth', '--out', 'b.mp4', '--spec', 'a.synth.json', '--quiet'], dir);
      expect(again.status).toBe(0);
      expect(again.stdout).toBe('');
      expect(await readFile(join(dir, 'b.truth.csv'), 'utf8')).toBe(truth);
      expect(Buffer.compare(await readFile(join(dir, 'b.mp4')), await readFile(join(dir, 'a.mp4')))).toBe(0);

      // an option on top of --spec overrides that one field only
      const faster = run(['synth', '--out', 'c.mp4', '--spec', 'a.synth.json', '--noise', '2', '--quiet'], dir);
      expect(faster.status).toBe(0);
      const c = JSON.parse(await readFile(join(dir, 'c.synth.json'), 'utf8'));
      expect(c.spec.realism.noise_sigma).toBe(2);
      expect(c.spec.realism.oblique).toEqual({ tilt_deg: 30, axis_deg: 15 });
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('rejects bad options with exit 2, one line and no files written', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-synth-cli-'));
    try {
      const bad: Array<[string[], RegExp]> = [
        [['--rate', 'fast'], /--rate "fast"/],
        [['--rate', '5', '--spin-up', '0,100,0.5'], /only one of/],
        [['--size', '321x240'], /odd side/],
        [['--spec', 'missing.json'], /cannot read --spec file/],
        [['--marker', '80,0,4,plaid'], /kind "plaid"/],
      ];
      for (const [args, pattern] of bad) {
        const r = run(['synth', '--out', 'x.mp4', ...args], dir);
        expect(r.status).toBe(2);
        expect(r.stderr).toMatch(pattern);
        expect(r.stderr.trim().split('\n')).toHaveLength(1);
      }
      expect(existsSync(join(dir, 'x.mp4'))).toBe(false);
      expect(await readdir(dir)).toEqual([]);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
