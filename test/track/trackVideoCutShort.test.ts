// A clip cut short with its index at the front decodes to the end of its data without an error; it is refused
// rather than tracked as if whole. A clip trimmed without re-encoding also lists more frames than it shows (the
// trimmed ones are marked to be dropped), but it is whole: it is tracked. Fixtures: our renderer, cut and trimmed
// with ffmpeg's own stream copy.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { probeVideoHeader } from '../../src/video/probeVideo.js';
import { InputError } from '../../src/errors.js';
import { ffmpeg } from '../video/referenceTools.js';

let dir: string;
let whole: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-cutshort-'));
  whole = (await renderClip({ seed: 3, duration_s: 3, fps: 30, profile: { kind: 'steady', rate_deg_s: 60 } }, join(dir, 'whole.mp4'))).videoPath; // lossless
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('trackVideo on clips whose index lists more frames than they show', () => {
  it('refuses a clip cut in half after its index was moved to the front, with one sentence', async () => {
    ffmpeg(['-i', whole, '-c', 'copy', '-movflags', '+faststart', join(dir, 'front.mp4')]);
    const bytes = await readFile(join(dir, 'front.mp4'));
    await writeFile(join(dir, 'cut.mp4'), bytes.subarray(0, Math.floor(bytes.length / 2)));
    const err = await trackVideo(join(dir, 'cut.mp4'), { centre: { x: 160, y: 120 } }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as Error).message).toMatch(/cut\.mp4 is cut short: its index lists 90 frames but only \d\d can be read \(an interrupted copy or recording\); copy or export it again\.$/);
  });

  it('tracks a clip trimmed without re-encoding (its index still lists the frames cut off the front)', async () => {
    ffmpeg(['-ss', '1', '-i', whole, '-c', 'copy', join(dir, 'trimmed.mp4')]);
    const header = await probeVideoHeader(join(dir, 'trimmed.mp4'));
    const r = await trackVideo(join(dir, 'trimmed.mp4'), { centre: { x: 160, y: 120 } });
    expect(header.declared_frame_count).toBeGreaterThan(r.series.frame.length);
    expect(r.series.frame.length).toBeGreaterThanOrEqual(59);
    expect(r.summary.frames.lost).toBe(0);
  });
});
