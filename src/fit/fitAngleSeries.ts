import type { FitReport, ModelName } from './FitReport.js';
import type { ModelCandidate, ModelFit } from './ModelFit.js';
import { fitSteadyRate, type SteadyRateFit } from './steadyRate.js';
import { fitSpinUp } from './spinUp.js';
import { fitCoastDown } from './coastDown.js';
import { chooseModel } from './chooseModel.js';
import { curveMisfit } from './curveMisfit.js';
import { repeatFreeRows } from './repeatFreeRows.js';
import { checkOptionNames } from '../checkOptionNames.js';
import { angleNoiseCovariance } from './angleNoiseModel.js';
import { smoothRate } from '../signal/smoothRate.js';
import { autocorrelation } from '../signal/longRunVariance.js';
import { InputError, RevtraceError } from '../errors.js';
import { SOFTWARE } from '../version.js';

/** Which model to fit: one of the three, or 'auto' (all three, chosen by chooseModel). */
export type FitModelOption = ModelName | 'auto';

/** Options of fitAngleSeries. */
export interface FitOptions {
  /** Default 'steady'. */
  model?: FitModelOption;
  /** Window start, s (default: first frame). */
  from_s?: number;
  /** Window end, s (default: last frame). */
  to_s?: number;
  /** Confidence level of every interval, 0 < level < 1 (default 0.95). */
  level?: number;
  /** Equivalence margin for the steady rate's TOST test, deg/s (> 0; default: no equivalence test). */
  margin_deg_s?: number;
  /** Seed of the nonlinear fits' bootstrap (default 1). */
  seed?: number;
  /** Half-width of the rate curve's smoothing window, s (default: chosen by cross-validation). */
  smoothing_half_width_s?: number;
}

/** The smoothed rate with a pointwise band: the rows of rate.csv. */
export interface RateSeries {
  t_s: Float64Array;
  rate_deg_s: Float64Array;
  lo_deg_s: Float64Array;
  hi_deg_s: Float64Array;
}

/** What fitAngleSeries returns: the contents of fit.json and of rate.csv. */
export interface FitResult {
  report: FitReport;
  rate: RateSeries;
}

/** The angle series to fit: frame times (s) and unwrapped angles (deg; NaN for a lost frame). */
export interface AngleSeriesInput {
  t_s: Float64Array;
  angle_deg: Float64Array;
  /** Share of frames lost by the tracker, 0…1, for a series whose lost frames were already removed
   * (when the series still holds NaN angles, the share of NaN rows in the window is used instead). */
  lost_share?: number;
}

/** Raised when a requested model cannot be fitted to the data (exit code 1). */
export class FitError extends RevtraceError {}

const MIN_ROWS = 10;

/** Validates times and selects the window's valid rows; throws InputError with one sentence. */
function selectWindow(input: AngleSeriesInput, options: FitOptions): { t: Float64Array; y: Float64Array; lost: number; rows: number } {
  const { t_s, angle_deg } = input;
  if (t_s.length !== angle_deg.length) throw new InputError(`the series has ${t_s.length} times but ${angle_deg.length} angles; give one angle per time`);
  for (let i = 0; i < t_s.length; i++) {
    if (!Number.isFinite(t_s[i]!)) throw new InputError(`time on row ${i + 1} is not a number; every row needs a time in seconds`);
    if (i > 0 && !(t_s[i]! > t_s[i - 1]!)) {
      throw new InputError(
        t_s[i] === t_s[i - 1]
          ? `time ${t_s[i]} s is repeated on rows ${i} and ${i + 1}; each frame needs its own time`
          : `times must increase, but row ${i + 1} (${t_s[i]} s) comes after ${t_s[i - 1]} s; sort the rows by time`,
      );
    }
  }
  if (t_s.length === 0) throw new InputError('the angle series is empty; track a video first');
  const first = t_s[0]!;
  const last = t_s[t_s.length - 1]!;
  const from = options.from_s ?? first;
  const to = options.to_s ?? last;
  if (!Number.isFinite(from) || !Number.isFinite(to)) throw new InputError('the window bounds --from and --to must be numbers of seconds');
  if (options.from_s !== undefined && options.from_s >= last) {
    throw new InputError(`--from ${options.from_s} s is at or after the last row (${last} s); choose a start inside the data (${first}–${last} s)`);
  }
  if (options.to_s !== undefined && options.to_s <= first) {
    throw new InputError(`--to ${options.to_s} s is at or before the first row (${first} s); choose an end inside the data (${first}–${last} s)`);
  }
  if (!(from < to)) throw new InputError(`the window ${from}–${to} s is empty; give --from smaller than --to`);
  const ts = new Float64Array(t_s.length);
  const ys = new Float64Array(t_s.length);
  let kept = 0;
  let rows = 0;
  for (let i = 0; i < t_s.length; i++) {
    const t = t_s[i]!;
    if (t < from || t > to) continue;
    rows++;
    if (Number.isFinite(angle_deg[i]!)) {
      ts[kept] = t;
      ys[kept] = angle_deg[i]!;
      kept++;
    }
  }
  if (kept < MIN_ROWS) {
    throw new InputError(`the window ${from}–${to} s holds ${kept} valid frames but a fit needs at least ${MIN_ROWS}; widen the window or track more frames`);
  }
  return { t: ts.slice(0, kept), y: ys.slice(0, kept), lost: rows - kept, rows };
}

function hasOnlyFiniteNumbers(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (Array.isArray(value)) return value.every(hasOnlyFiniteNumbers);
  if (value && typeof value === 'object') return Object.values(value).every(hasOnlyFiniteNumbers);
  return true;
}

/** n(1 − ρ)/(1 + ρ): the AR(1) effective sample size of residuals with lag-1 autocorrelation ρ (clamped to ≥ 0). */
function effectiveCount(residuals: Float64Array): number {
  const rho = Math.max(0, autocorrelation(residuals, 1)[0] ?? 0);
  return Math.max(2, (residuals.length * (1 - rho)) / (1 + rho));
}

const METHOD_STEADY =
  'steady rate by generalised least squares with a white + AR(1) + random-walk angle-noise model fitted to the variogram (Kalman filter on the real frame times), standard error by a delete-a-batch jackknife over 8 contiguous batches with a Student-t interval (at most 7 df, fewer when a few batches dominate), zero test two-sided t, equivalence by two one-sided tests, minimum detectable rate (t_{1−α/2} + t_{0.8})·se';
const METHOD_NONLINEAR = 'spin-up and coast-down by Levenberg–Marquardt least squares with autocorrelation-aware intervals';
const METHOD_NOT_CHOSEN = 'intervals of a spin-up or coast-down model that auto did not choose are plain Student-t, without the bootstrap calibration';
const METHOD_RATE = 'rate curve by local quadratic least squares in real time (Savitzky–Golay on non-uniform frames)';

/** Every option name fitAngleSeries reads. */
const FIT_OPTION_NAMES: readonly (keyof FitOptions)[] = ['model', 'from_s', 'to_s', 'level', 'margin_deg_s', 'seed', 'smoothing_half_width_s'];
/** Spellings people reach for, and the option meant. */
const FIT_OPTION_SPELLINGS: Record<string, keyof FitOptions> = { from: 'from_s', to: 'to_s', margin: 'margin_deg_s', confidence: 'level', smoothing: 'smoothing_half_width_s', half_width_s: 'smoothing_half_width_s' };

/**
 * Fits an angle series: the requested model ('steady', 'spinup', 'spindown', or 'auto' = all three, chosen
 * by chooseModel) over a time window, with diagnostics, plus the smoothed rate curve with a pointwise band.
 * Lost frames (NaN angles) are dropped; the times of the remaining frames are used as they are.
 * With 'auto' every model that could be fitted is reported; `model` names the chosen one.
 * @throws InputError for bad input (one sentence), FitError when the requested model cannot be fitted
 */
export function fitAngleSeries(input: AngleSeriesInput, options: FitOptions = {}): FitResult {
  checkOptionNames('fitAngleSeries', options, FIT_OPTION_NAMES, FIT_OPTION_SPELLINGS);
  const model = options.model ?? 'steady';
  const level = options.level ?? 0.95;
  if (!(level > 0 && level < 1)) throw new InputError(`the confidence level must lie between 0 and 1 (e.g. 0.95), got ${level}`);
  if (options.margin_deg_s !== undefined && !(options.margin_deg_s > 0)) {
    throw new InputError(`the equivalence margin must be a positive rate in deg/s, got ${options.margin_deg_s}`);
  }
  if (!['steady', 'spinup', 'spindown', 'auto'].includes(model)) {
    throw new InputError(`unknown model "${model}"; choose steady, spinup, spindown or auto`);
  }
  const { t, y, lost, rows } = selectWindow(input, options);
  const n = t.length;
  // counted inside the window when lost frames are still in the series (NaN); else as the caller says
  const lostShare = lost > 0 || input.lost_share === undefined ? lost / rows : input.lost_share;
  const warnings: string[] = [];
  const fitOptions = { level, seed: options.seed ?? 1 };
  // With 'auto' the choice rests on the point fits alone, so the nonlinear models are fitted without the
  // bootstrap first and only the chosen one is refitted with it (the bootstrap is most of their cost).
  const firstPass = model === 'auto' ? { ...fitOptions, replicates: 0 } : fitOptions;

  let steady: SteadyRateFit | undefined;
  const nonlinear: Partial<Record<'spinup' | 'spindown', ModelFit<unknown>>> = {};
  const wanted: ModelName[] = model === 'auto' ? ['steady', 'spinup', 'spindown'] : [model];
  const notFitted: string[] = [];
  for (const name of wanted) {
    try {
      if (name === 'steady') {
        steady = fitSteadyRate(t, y, { level, ...(options.margin_deg_s !== undefined ? { margin_deg_s: options.margin_deg_s } : {}) });
      } else {
        const fit = name === 'spinup' ? fitSpinUp(t, y, firstPass) : fitCoastDown(t, y, firstPass);
        if (!hasOnlyFiniteNumbers(fit.result)) throw new FitError(`the ${name === 'spinup' ? 'spin-up' : 'coast-down'} fit gave no finite estimates for this window; try another --model or a window where the rotor changes speed`);
        nonlinear[name] = fit;
      }
    } catch (err) {
      if (model !== 'auto' || (name === 'steady' && err instanceof InputError)) {
        if (err instanceof RevtraceError) throw err;
        throw new FitError(`the ${name} fit failed (${err instanceof Error ? err.message : String(err)}); try another model or window`, 1, { cause: err });
      }
      notFitted.push(`the ${name} model could not be fitted: ${err instanceof Error ? err.message : String(err)}`);
    }
  }
  const fits: Partial<Record<ModelName, ModelFit<unknown>>> = { ...nonlinear, ...(steady ? { steady } : {}) };
  const fitted = (Object.keys(fits) as ModelName[]).filter((k) => fits[k]);
  if (fitted.length === 0) throw new FitError('no model could be fitted to this window; check the angle series');

  let chosen: ModelName = fitted[0]!;
  let selection: FitReport['selection'];
  if (model === 'auto') {
    const candidates: ModelCandidate[] = fitted.map((k) => {
      const f = fits[k]!;
      return { ...f.candidate, n_eff: f.candidate.n_eff ?? effectiveCount(f.residuals_deg) };
    });
    const choice = chooseModel(candidates);
    chosen = choice.chosen;
    selection = { rule: choice.rule, scores: choice.scores, ambiguous: choice.ambiguous, notes: notFitted };
    if (choice.ambiguous) warnings.push('the model choice is ambiguous: the runner-up scores within the margin, so report both or fix the model');
    if (chosen === 'spinup' || chosen === 'spindown') {
      try {
        const calibrated = chosen === 'spinup' ? fitSpinUp(t, y, fitOptions) : fitCoastDown(t, y, fitOptions);
        nonlinear[chosen] = calibrated;
        fits[chosen] = calibrated;
      } catch (err) {
        warnings.push(`the ${chosen} intervals could not be bootstrap-calibrated (${err instanceof Error ? err.message : String(err)}); they are plain Student-t and may be too narrow`);
      }
    }
  }
  const best = fits[chosen]!;
  for (const w of best.warnings) warnings.push(w);
  for (const k of fitted) if (k !== chosen) for (const w of fits[k]!.warnings) selection?.notes.push(`${k}: ${w}`);
  if (!best.converged) warnings.push(`the ${chosen} fit did not converge; treat its numbers as rough`);
  if (lostShare > 0.2) warnings.push(`${(100 * lostShare).toFixed(0)}% of frames were lost in the window; check the tracking before trusting the numbers`);

  // a steady run's band uses the noise model its rate was fitted with (white + AR + walk); the models of a
  // changing rate have no such description, and their band keeps the residual-based inflation
  const noise = chosen === 'steady' && steady ? steady.noise : null;
  const rate = smoothRate(t, y, {
    level,
    ...(options.smoothing_half_width_s !== undefined ? { halfWidth_s: options.smoothing_half_width_s } : {}),
    ...(noise ? { noiseCovariance: (lag_s: number) => angleNoiseCovariance(noise, lag_s) } : {}),
  });
  const residuals = best.residuals_deg;
  let rss = 0;
  for (const e of residuals) rss += e * e;
  const residualAutocorrelation = autocorrelation(residuals, 5);
  if (chosen !== 'steady') {
    // judged on the rows the curve was fitted to: repeats of a still picture carry no noise (repeatFreeRows)
    const rows = repeatFreeRows(y);
    const kept = Float64Array.from(rows, (i) => residuals[i]!);
    const keptRms = Math.sqrt(kept.reduce((a, e) => a + e * e, 0) / Math.max(1, kept.length));
    const misfit = curveMisfit(chosen === 'spinup' ? 'spin-up' : 'coast-down', keptRms, autocorrelation(kept, 1)[0] ?? 0, Float64Array.from(rows, (i) => y[i]!));
    if (misfit) warnings.push(misfit);
  }
  const methods = [
    ...(fits.steady ? [METHOD_STEADY] : []),
    ...(fits.spinup || fits.spindown ? [METHOD_NONLINEAR] : []),
    ...(model === 'auto' && (fits.spinup || fits.spindown) ? [METHOD_NOT_CHOSEN] : []),
    ...(selection ? [`model chosen automatically (${selection.rule})`] : []),
    `${METHOD_RATE}, ${rate.windowRule}, band ${noise ? `from the steady noise model (×${Math.sqrt(rate.bandInflation).toFixed(2)} the white-noise band)` : `widened ×${Math.sqrt(rate.bandInflation).toFixed(2)} for residual autocorrelation`}`,
  ];
  const report: FitReport = {
    model: chosen,
    window_s: [t[0]!, t[n - 1]!],
    n,
    method: methods.join('; ') + '.',
    diagnostics: {
      residual_autocorrelation: residualAutocorrelation.map((r) => Number(r.toFixed(4))),
      lost_share: lostShare,
      residual_rms_deg: Math.sqrt(rss / n),
      warnings,
    },
    ...(selection ? { selection } : {}),
    ...(steady ? { steady: steady.result } : {}),
    ...(nonlinear.spinup ? { spinup: nonlinear.spinup.result as FitReport['spinup'] } : {}),
    ...(nonlinear.spindown ? { spindown: nonlinear.spindown.result as FitReport['spindown'] } : {}),
    software: { ...SOFTWARE },
  };
  if (!hasOnlyFiniteNumbers(report)) throw new FitError('the fit produced a value that is not a finite number; try a narrower window or another model');
  return { report, rate: { t_s: rate.t_s, rate_deg_s: rate.rate_deg_s, lo_deg_s: rate.lo_deg_s, hi_deg_s: rate.hi_deg_s } };
}
