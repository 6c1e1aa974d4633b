import { ensureWritableFolder } from '../ensureWritableFolder.js';
import { dirname, basename, extname, join } from 'node:path';
import { SOFTWARE } from '../version.js';
import type { VideoFrameIn } from '../video/writeVideo.js';
import { writeVideo } from '../video/writeVideo.js';
import { writeFileAtomic } from '../writeFileAtomic.js';
import { anchorRegion } from './anchorRegion.js';
import { frameTimes } from './frameTimes.js';
import { renderFrame } from './renderFrame.js';
import type { SynthSpec, SynthSpecInput } from './SynthSpec.js';
import { resolveSynthSpec } from './SynthSpec.js';
import type { SynthTruth } from './truthTable.js';
import { formatTruthCsv, truthColumns } from './truthTable.js';

/** Options of renderClip. */
export interface RenderClipOptions {
  /** ffmpeg executable (default: located by the video stage). */
  ffmpeg?: string;
  signal?: AbortSignal;
  /** Called after each frame is rendered. */
  onProgress?: (p: { frames: number; frame_count: number }) => void;
}

/** What renderClip wrote and the truth it holds. */
export interface SynthClip {
  videoPath: string;
  /** `<video without extension>.truth.csv` */
  truthPath: string;
  /** `<video without extension>.synth.json`: the resolved spec and where the fiducial is. */
  specPath: string;
  frame_count: number;
  spec: SynthSpec;
  truth: SynthTruth;
}

/** Paths of the truth table and spec sidecar beside a video. */
export function synthSidecarPaths(videoPath: string): { truthPath: string; specPath: string } {
  const stem = join(dirname(videoPath), basename(videoPath, extname(videoPath)));
  return { truthPath: `${stem}.truth.csv`, specPath: `${stem}.synth.json` };
}

/**
 * Renders a whole synthetic clip: encodes the frames with writeVideo (lossless unless the spec sets a crf),
 * then writes the per-frame truth table and a JSON sidecar with the resolved spec beside the video, each atomically.
 */
export async function renderClip(specInput: SynthSpec | SynthSpecInput, videoPath: string, options: RenderClipOptions = {}): Promise<SynthClip> {
  const spec = resolveSynthSpec(specInput as SynthSpecInput);
  const t_s = frameTimes(spec);
  const n = t_s.length;
  const truth: SynthTruth = {
    t_s,
    angle_deg: new Float64Array(n),
    rate_deg_s: new Float64Array(n),
    markers: spec.markers.map(() => ({ x_px: new Float64Array(n), y_px: new Float64Array(n), occluded: new Uint8Array(n) })),
  };
  function* frames(): Generator<VideoFrameIn> {
    for (let f = 0; f < n; f++) {
      const frame = renderFrame(spec, t_s[f], f);
      truth.angle_deg[f] = frame.angle_deg;
      truth.rate_deg_s[f] = frame.rate_deg_s;
      frame.markers.forEach((m, i) => {
        truth.markers[i].x_px[f] = m.x_px;
        truth.markers[i].y_px[f] = m.y_px;
        truth.markers[i].occluded[f] = m.occluded ? 1 : 0;
      });
      options.onProgress?.({ frames: f + 1, frame_count: n });
      yield { t_s: t_s[f], data: frame.data };
    }
  }
  await ensureWritableFolder(dirname(videoPath), "the video's folder");
  await writeVideo(videoPath, frames(), {
    width: spec.width_px,
    height: spec.height_px,
    channels: spec.channels,
    quality: spec.realism.crf === null ? 'lossless' : { crf: spec.realism.crf },
    ffmpeg: options.ffmpeg,
    signal: options.signal,
  });
  const withParticles = spec.realism.particles.share > 0;
  const { truthPath, specPath } = synthSidecarPaths(videoPath);
  await writeFileAtomic(truthPath, formatTruthCsv(truth, withParticles));
  const sidecar = {
    software: SOFTWARE,
    video: basename(videoPath),
    truth: basename(truthPath),
    truth_columns: truthColumns(spec.markers.length, withParticles),
    frame_count: n,
    anchor_region: anchorRegion(spec),
    spec,
  };
  await writeFileAtomic(specPath, `${JSON.stringify(sidecar, null, 2)}\n`);
  return { videoPath, truthPath, specPath, frame_count: n, spec, truth };
}
