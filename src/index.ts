// The revtrace library: the pipeline functions and their types. Internal helpers stay internal.
export { RevtraceError, InputError } from './errors.js';
export { VERSION } from './version.js';
export type { Frame } from './video/Frame.js';
export type { AngleSeries } from './track/AngleSeries.js';
export type { TrackSummary, PointPx } from './track/TrackSummary.js';
export type { FitReport, Estimate, SteadyResult, SpinUpResult, SpinDownResult, ZeroTest, SegmentRate, ModelName } from './fit/FitReport.js';
export type { RunRecord, Direction } from './batch/RunRecord.js';
