import { existsSync } from 'node:fs';
import { readFile, rm } from 'node:fs/promises';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import { renderClip } from '../synth/renderClip.js';
import { cleanStaleTemps } from '../batch/cleanStaleTemps.js';
import { resolveSynthSpec } from '../synth/SynthSpec.js';
import { writeFileAtomic } from '../writeFileAtomic.js';
import type { DemoRun } from './demoDay.js';

/** Index file of rendered demo clips: clip name → hash of the spec it was rendered from. */
const INDEX = 'clips.index.json';

/** Share of the bytes kept when a clip is spoiled (cut short, as by a full memory card). */
const SPOILED_SHARE = 0.35;

function specHash(run: DemoRun): string {
  const key = JSON.stringify({ spec: resolveSynthSpec(run.spec), spoiled: run.spoiled });
  return createHash('sha256').update(key).digest('hex');
}

/**
 * Renders each demo clip into `clipsDir` unless a clip from the same spec is already there (so a second
 * demo run reuses the footage). A spoiled clip is rendered, then cut short. Returns how many were rendered.
 */
export async function prepareDemoClips(runs: DemoRun[], clipsDir: string, options: { ffmpeg?: string; onLog?: (line: string) => void } = {}): Promise<{ rendered: number; reused: number }> {
  const indexPath = join(clipsDir, INDEX);
  let index: Record<string, string> = {};
  try {
    index = JSON.parse(await readFile(indexPath, 'utf8')) as Record<string, string>;
  } catch {
    index = {};
  }
  await cleanStaleTemps([clipsDir]); // left by an interrupted demo
  let rendered = 0;
  let reused = 0;
  for (const run of runs) {
    const path = join(clipsDir, run.clip);
    const hash = specHash(run);
    if (index[run.clip] === hash && existsSync(path)) {
      reused++;
      continue;
    }
    options.onLog?.(`rendering ${run.clip}${run.spoiled ? ' (to be cut short)' : ''}`);
    if (run.spoiled) {
      const full = join(clipsDir, `.full-${run.clip}`);
      const clip = await renderClip(run.spec, full, { ffmpeg: options.ffmpeg });
      const bytes = await readFile(full);
      await writeFileAtomic(path, bytes.subarray(0, Math.floor(bytes.length * SPOILED_SHARE)));
      await Promise.all([full, clip.truthPath, clip.specPath].map((f) => rm(f, { force: true })));
    } else {
      await renderClip(run.spec, path, { ffmpeg: options.ffmpeg });
    }
    index[run.clip] = hash;
    await writeFileAtomic(indexPath, `${JSON.stringify(index, null, 2)}\n`);
    rendered++;
  }
  return { rendered, reused };
}
