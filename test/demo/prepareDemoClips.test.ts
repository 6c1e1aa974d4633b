// prepareDemoClips tidies what an interrupted demo left in its clips folder (a half-written clip's temporary file).
import { describe, expect, it } from 'vitest';
import { mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { prepareDemoClips } from '../../src/demo/prepareDemoClips.js';

describe('prepareDemoClips', () => {
  it('removes temporary files left by an interrupted demo, and nothing else', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'revtrace-democlips-'));
    try {
      await writeFile(join(dir, '.F12-b.mp4.4242.deadbeef.tmp'), 'half a clip');
      await writeFile(join(dir, 'notes.txt'), 'the lab notebook page');
      expect(await prepareDemoClips([], dir)).toEqual({ rendered: 0, reused: 0 });
      expect(await readdir(dir)).toEqual(['notes.txt']);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
