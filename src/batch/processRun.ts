import { join } from 'node:path';
import { fitAngleSeries } from '../fit/fitAngleSeries.js';
import { writeFitOutputs } from '../fit/writeFitOutputs.js';
import type { TrackOptions } from '../track/TrackOptions.js';
import { trackVideo } from '../track/trackVideo.js';
import { writeTrackOutputs } from '../track/writeTrackOutputs.js';
import type { RunJob, RunProcessor } from './RunJob.js';
import { runRecordFor } from './runRecordFor.js';
import { inManifestTerms } from './inManifestTerms.js';

/** The track options of a job: its effective settings, with nulls left to the tracker's defaults. */
export function trackOptionsFor(job: RunJob): TrackOptions {
  const t = job.settings.track;
  const o: TrackOptions = {};
  if (t.roi) o.roi = t.roi;
  if (t.centre) o.centre = { x_px: t.centre.x_px, y_px: t.centre.y_px };
  if (t.marker) o.marker = t.marker;
  if (t.anchor) o.anchor = t.anchor;
  if (t.from_s !== null) o.from_s = t.from_s;
  if (t.to_s !== null) o.to_s = t.to_s;
  if (t.tilt_deg !== null) o.tilt_deg = t.tilt_deg;
  if (t.markers !== null) o.markers = t.markers;
  if (job.tools.ffmpeg) o.ffmpeg = job.tools.ffmpeg;
  if (job.tools.ffprobe) o.ffprobe = job.tools.ffprobe;
  return o;
}

/**
 * The real per-run processor: tracks the video, fits the angle series, writes angle.csv, track.json,
 * preview.png, fit.json and rate.csv (each atomically) into the run folder, and returns the record.
 */
export const processRun: RunProcessor = async (job, signal, onProgress) => {
  const started = new Date();
  const track = await trackVideo(job.video_abs, { ...trackOptionsFor(job), signal, onProgress });
  signal.throwIfAborted();
  // settings came from manifest columns, so messages name the columns, not command-line options
  track.summary.warnings = track.summary.warnings.map(inManifestTerms);
  await writeTrackOutputs(job.run_dir, track);
  const frames = track.summary.frames;
  const lost_share = frames.decoded > 0 ? frames.lost / frames.decoded : 1;
  const f = job.settings.fit;
  const fit = fitAngleSeries(
    { t_s: track.series.t_s, angle_deg: track.series.angle_deg, lost_share },
    { model: f.model, level: f.level, seed: f.seed, ...(f.margin_deg_s !== null ? { margin_deg_s: f.margin_deg_s } : {}) },
  );
  signal.throwIfAborted();
  await writeFitOutputs(join(job.run_dir, 'fit.json'), fit);
  const finished = new Date();
  return runRecordFor(job, {
    status: 'ok',
    error: null,
    fit: fit.report,
    lost_share,
    warnings: [...new Set([...track.summary.warnings, ...fit.report.diagnostics.warnings.map(inManifestTerms)])],
    started_at: started.toISOString(),
    finished_at: finished.toISOString(),
    elapsed_s: (finished.getTime() - started.getTime()) / 1000,
    outputs: ['angle.csv', 'track.json', 'preview.png', 'fit.json', 'rate.csv'],
  });
};
