// A clip that decodes to the end without an error but holds fewer frames than its index lists (cut short with the
// index at the front) is refused rather than tracked as if it were whole.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { renderClip } from '../../src/synth/renderClip.js';
import { trackVideo } from '../../src/track/trackVideo.js';
import { probeVideoHeader } from '../../src/video/probeVideo.js';
import { InputError } from '../../src/errors.js';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'revtrace-cutshort-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('trackVideo on a clip whose index lists more frames than it holds', () => {
  it('refuses the whole clip with one sentence, but tracks a window of it (--from/--to read only part anyway)', async () => {
    const clip = await renderClip({ seed: 3, duration_s: 1, fps: 30, profile: { kind: 'steady', rate_deg_s: 200 } }, join(dir, 'c.mp4'));
    const header = await probeVideoHeader(clip.videoPath);
    expect(header.declared_frame_count).toBe(30); // the MP4 sample table of a 1 s clip at 30 fps
    // the index of a clip cut short still lists every frame: stand in for it by a header that lists 90
    const listed = { ...header, declared_frame_count: 90 };
    const err = await trackVideo(clip.videoPath, { header: listed, centre: { x: 160, y: 120 } }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(InputError);
    expect((err as Error).message).toBe(`${clip.videoPath} is cut short: its index lists 90 frames but only 30 can be read (an interrupted copy or recording); copy or export it again.`);
    const part = await trackVideo(clip.videoPath, { header: listed, centre: { x: 160, y: 120 }, from_s: 0, to_s: 0.5 });
    expect(part.series.frame.length).toBe(15);
  });
});
