import { RevtraceError } from '../errors.js';
import type { FitReport } from '../fit/FitReport.js';
import type { AngleSeries } from '../track/AngleSeries.js';
import type { TrackSummary } from '../track/TrackSummary.js';
import type { RunJob, RunProcessor } from './RunJob.js';
import { runRecordFor } from './runRecordFor.js';

// Shapes of the track and fit stages as agreed in the team's contracts.
interface TrackResultShape {
  series: AngleSeries;
  summary: TrackSummary;
  preview: { width: number; height: number; rgb: Uint8Array };
}
interface FitResultShape {
  report: FitReport;
  rate: unknown;
}
interface Stages {
  trackVideo(path: string, options: Record<string, unknown>): Promise<TrackResultShape>;
  writeTrackOutputs(dir: string, result: TrackResultShape): Promise<void>;
  fitAngleSeries(input: { t_s: Float64Array; angle_deg: Float64Array; lost_share?: number }, options: Record<string, unknown>): FitResultShape;
  writeFitOutputs(fitJsonPath: string, result: FitResultShape): Promise<void>;
}

let stages: Promise<Stages> | null = null;

/** Loads the track and fit stages once. */
function loadStages(): Promise<Stages> {
  stages ??= (async () => {
    const load = async (file: string) => {
      try {
        return (await import(new URL(file, import.meta.url).href)) as Record<string, unknown>;
      } catch (err) {
        throw new RevtraceError(`this copy of revtrace cannot load ${file.replace('../', '')} (${(err as Error).message}); rebuild it with npm run build`);
      }
    };
    const [t, wt, f, wf] = await Promise.all([load('../track/trackVideo.js'), load('../track/writeTrackOutputs.js'), load('../fit/fitAngleSeries.js'), load('../fit/writeFitOutputs.js')]);
    return { trackVideo: t.trackVideo, writeTrackOutputs: wt.writeTrackOutputs, fitAngleSeries: f.fitAngleSeries, writeFitOutputs: wf.writeFitOutputs } as Stages;
  })();
  return stages;
}

/** The track options of a job: its effective settings, with nulls left to the tracker's defaults. */
export function trackOptionsFor(job: RunJob): Record<string, unknown> {
  const t = job.settings.track;
  const o: Record<string, unknown> = {};
  if (t.roi) o.roi = t.roi;
  if (t.centre) o.centre = { x: t.centre.x_px, y: t.centre.y_px };
  if (t.marker) o.marker = t.marker;
  if (t.anchor) o.anchor = t.anchor;
  if (t.from_s !== null) o.from_s = t.from_s;
  if (t.to_s !== null) o.to_s = t.to_s;
  if (t.tilt_deg !== null) o.tilt_deg = t.tilt_deg;
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
  const s = await loadStages();
  const track = await s.trackVideo(job.video_abs, { ...trackOptionsFor(job), signal, onProgress });
  signal.throwIfAborted();
  await s.writeTrackOutputs(job.run_dir, track);
  const frames = track.summary.frames;
  const lost_share = frames.decoded > 0 ? frames.lost / frames.decoded : 1;
  const f = job.settings.fit;
  const fit = s.fitAngleSeries(
    { t_s: track.series.t_s, angle_deg: track.series.angle_deg, lost_share },
    { model: f.model, level: f.level, seed: f.seed, ...(f.margin_deg_s !== null ? { margin_deg_s: f.margin_deg_s } : {}) },
  );
  signal.throwIfAborted();
  await s.writeFitOutputs(`${job.run_dir}/fit.json`, fit);
  const finished = new Date();
  return runRecordFor(job, {
    status: 'ok',
    error: null,
    fit: fit.report,
    lost_share,
    warnings: [...new Set([...track.summary.warnings, ...fit.report.diagnostics.warnings])],
    started_at: started.toISOString(),
    finished_at: finished.toISOString(),
    elapsed_s: (finished.getTime() - started.getTime()) / 1000,
    outputs: ['angle.csv', 'track.json', 'preview.png', 'fit.json', 'rate.csv'],
  });
};
