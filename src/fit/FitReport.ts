/** An estimate with its standard error and a confidence interval at `level` (e.g. 0.95). */
export interface Estimate {
  value: number;
  se: number;
  ci: [number, number];
  level: number;
}

/** Rate over one segment of a steady window. */
export interface SegmentRate {
  t0_s: number;
  t1_s: number;
  rate_deg_s: Estimate;
}

/** Whether a steady rate differs from zero, and (with a margin) whether it is equivalent to zero. */
export interface ZeroTest {
  /** Two-sided p-value of H0: rate = 0. */
  p_value: number;
  /** One-sided p-value that the rate has the sign of the estimate (H0: rate has the other sign or is zero). */
  p_sign: number;
  statistic: number;
  df: number;
  /** Present when a margin was given: TOST equivalence test against ±margin_deg_s. */
  margin_deg_s?: number;
  equivalence_p_value?: number;
  equivalent_to_zero?: boolean;
}

export interface SteadyResult {
  rate_deg_s: Estimate;
  rate_rpm: Estimate;
  rate_rev_s: Estimate;
  segments: SegmentRate[];
  zero_test: ZeroTest;
  /** Smallest |rate| this run would detect at the given level with 80% power, deg/s. */
  min_detectable_deg_s: number;
  /** Optional: p-value of a test that all segment rates are equal (small: the rate drifts within the window). */
  segment_p_value?: number;
  /** Optional: the angle-noise model behind the interval (white + AR(1) + random walk, fitted to the variogram). */
  noise?: SteadyNoise;
  /** Optional: the rate allowing for a rate wander too small for this window to detect. */
  wander_allowance?: WanderAllowance;
}

/**
 * The steady rate once more, allowing for a rate wander (a random walk of the angle) that the window is too short
 * to detect: wider than rate_deg_s when the noise model found no walk, the same when it found one.
 */
export interface WanderAllowance {
  /** Largest walk this window cannot rule out (one-sided, at the report's level), deg/√s; null when the noise model holds a walk. */
  hidden_walk_bound_deg_per_sqrt_s: number | null;
  rate_deg_s: Estimate;
  zero_test: ZeroTest;
}

/** The angle noise the steady fit found: SDs in deg, the AR correlation time in s, the walk in deg/√s. */
export interface SteadyNoise {
  white_sd_deg: number;
  ar_sd_deg: number;
  ar_time_s: number;
  walk_deg_per_sqrt_s: number;
  /** Batches of the jackknife standard error (its Student-t df is batches − 1). */
  batches: number;
}

export interface SpinUpResult {
  onset_s: Estimate;
  terminal_rate_deg_s: Estimate;
  terminal_rate_rpm: Estimate;
  tau_s: Estimate;
  theta0_deg: Estimate;
}

export interface SpinDownResult {
  initial_rate_deg_s: Estimate;
  initial_rate_rpm: Estimate;
  coulomb_deg_s2: Estimate;
  viscous_per_s: Estimate;
  /** Time the model reaches ω = 0, seconds, or null if it does not stop in the window. */
  stop_s: number | null;
}

export type ModelName = 'steady' | 'spinup' | 'spindown';

/** The contents of fit.json. */
export interface FitReport {
  model: ModelName;
  window_s: [number, number];
  n: number;
  /** A sentence naming the methods used. */
  method: string;
  diagnostics: {
    /** Residual autocorrelation at lags 1, 2, 3, … */
    residual_autocorrelation: number[];
    lost_share: number;
    residual_rms_deg: number;
    warnings: string[];
  };
  /** Present when the model was chosen automatically. */
  selection?: {
    rule: string;
    scores: Partial<Record<ModelName, number>>;
    ambiguous: boolean;
    /** What the models not chosen said: why one could not be fitted, and their own warnings (not about the chosen numbers). */
    notes: string[];
  };
  steady?: SteadyResult;
  spinup?: SpinUpResult;
  spindown?: SpinDownResult;
  software: { name: 'revtrace'; version: string };
}
