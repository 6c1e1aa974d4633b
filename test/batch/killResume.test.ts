// Kills a batch with SIGKILL at chosen moments and checks that a rerun ends exactly like an
// uninterrupted batch. The batch runs in a child process from dist/ (run `npm run build` first)
// with the stand-in processor of fakeProcessor.mjs, which can pause at a named point.
import { describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { mkdir, mkdtemp, readdir, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const script = fileURLToPath(new URL('./fakeBatch.mjs', import.meta.url));
const RUNS = [['f1a', 'forward', '1', 'rate=120'], ['f1b', 'forward', '1', 'rate=121'], ['f2a', 'forward', '2', 'rate=240'], ['r1a', 'reverse', '1', 'rate=-3'], ['r1b', 'reverse', '1', 'rate=-2.5'], ['r2a', 'reverse', '2', 'rate=0.2']];

async function day(): Promise<{ dir: string; manifest: string }> {
  const dir = await mkdtemp(join(tmpdir(), 'revtrace-kill-'));
  await mkdir(join(dir, 'clips'));
  const lines = ['video,run,direction,setting'];
  for (const [run, direction, setting, content] of RUNS) {
    await writeFile(join(dir, 'clips', `${run}.mp4`), content!);
    lines.push(`clips/${run}.mp4,${run},${direction},${setting}`);
  }
  await writeFile(join(dir, 'day.csv'), `${lines.join('\n')}\n`);
  return { dir, manifest: join(dir, 'day.csv') };
}

function runToEnd(manifest: string, out: string, delayMs = 0): void {
  const r = spawnSync(process.execPath, [script, manifest, out], { encoding: 'utf8', env: { ...process.env, FAKE_DELAY_MS: String(delayMs) } });
  expect(r.stderr).toBe('');
  expect(r.status).toBe(0);
}

/** Starts the batch and SIGKILLs it when `when` matches an output line (or after `afterMs` from the first run start). */
function runAndKill(manifest: string, out: string, o: { pauseAt?: string; afterStartMs?: number; delayMs?: number }): Promise<string> {
  return new Promise((resolve, reject) => {
    const args = [script, manifest, out, ...(o.pauseAt ? [o.pauseAt] : [])];
    const child = spawn(process.execPath, args, { env: { ...process.env, FAKE_DELAY_MS: String(o.delayMs ?? 0) }, stdio: ['ignore', 'pipe', 'inherit'] });
    let text = '';
    let armed = false;
    child.stdout.on('data', (chunk: Buffer) => {
      text += chunk.toString();
      if (o.pauseAt && text.includes(`PAUSED ${o.pauseAt}`)) child.kill('SIGKILL');
      if (o.afterStartMs !== undefined && !armed && text.includes('"type":"start"')) {
        armed = true;
        setTimeout(() => child.kill('SIGKILL'), o.afterStartMs);
      }
    });
    child.on('error', reject);
    child.on('exit', (code, signal) => (signal === 'SIGKILL' ? resolve(text) : reject(new Error(`the batch ended by itself (exit ${code}) before it was killed:\n${text}`))));
  });
}

/** Every file under a folder, relative paths, sorted. */
async function tree(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const d of await readdir(dir, { withFileTypes: true, recursive: true })) if (d.isFile()) out.push(join(d.parentPath, d.name).slice(dir.length + 1));
  return out.sort();
}

describe('kill -9 and resume', () => {
  it('ends with the same summary and no partial files, whatever moment the batch was killed', async () => {
    const { dir, manifest } = await day();
    const reference = join(dir, 'reference');
    runToEnd(manifest, reference);
    const expectedSummary = await readFile(join(reference, 'summary.csv'), 'utf8');
    const expectedTree = await tree(reference);

    const cases: { name: string; pauseAt?: string; afterStartMs?: number; delayMs?: number; leaves?: RegExp }[] = [
      { name: 'mid-decode', pauseAt: 'r1a:decode' },
      { name: 'mid-write', pauseAt: 'f2a:midwrite', leaves: /^runs\/f2a\/\.angle\.csv\.\d+\.deadbeef\.tmp$/ },
      { name: 'early', afterStartMs: 30, delayMs: 120 },
      { name: 'late', afterStartMs: 250, delayMs: 120 },
    ];
    for (const c of cases) {
      const out = join(dir, c.name);
      await runAndKill(manifest, out, c);
      const left = await tree(out).catch(() => []);
      expect(left, c.name).not.toContain('summary.csv');
      if (c.leaves) expect(left.some((f) => c.leaves!.test(f)), c.name).toBe(true);
      runToEnd(manifest, out);
      expect(await readFile(join(out, 'summary.csv'), 'utf8'), c.name).toBe(expectedSummary);
      expect(await tree(out), c.name).toEqual(expectedTree);
    }
  });
});
