/**
 * Rotation profiles of a synthetic rotor, each with a closed form for angle and rate.
 * Angles in degrees, counterclockwise positive as seen in the displayed video; times in seconds.
 */

/** Constant rate from t = 0 (tiny rates and either sign allowed). */
export interface SteadyProfile {
  kind: 'steady';
  /** Angle at t = 0, degrees. */
  angle0_deg: number;
  rate_deg_s: number;
}

/**
 * At rest until t0_s, then a first-order spin-up towards a terminal rate:
 * θ = θ0 + ω∞[(t−t0) − τ(1 − e^{−(t−t0)/τ})] for t > t0.
 */
export interface SpinUpProfile {
  kind: 'spinup';
  angle0_deg: number;
  t0_s: number;
  terminal_rate_deg_s: number;
  tau_s: number;
}

/**
 * Turning at start_rate_deg_s until t0_s, then coasting down under Coulomb plus viscous friction,
 * dω/dt = −sign(ω)·c − kω, until ω = 0, where it stays stopped.
 */
export interface CoastDownProfile {
  kind: 'coastdown';
  angle0_deg: number;
  t0_s: number;
  start_rate_deg_s: number;
  /** Coulomb (constant) deceleration c, deg/s². */
  coulomb_deg_s2: number;
  /** Viscous coefficient k, 1/s. */
  viscous_per_s: number;
}

/** One phase of a sequence; each phase starts from the angle and rate where the previous one ended. */
export type SequencePhase =
  | { kind: 'rest'; duration_s: number }
  | { kind: 'spinup'; duration_s: number; terminal_rate_deg_s: number; tau_s: number }
  | { kind: 'steady'; duration_s: number }
  | { kind: 'coastdown'; duration_s: number; coulomb_deg_s2: number; viscous_per_s: number };

/**
 * Phases in order (e.g. rest → spin-up → steady → coast-down after the valve closes), continuous in
 * angle and rate; the last phase continues past its duration.
 */
export interface SequenceProfile {
  kind: 'sequence';
  angle0_deg: number;
  phases: SequencePhase[];
}

export type RotationProfile = SteadyProfile | SpinUpProfile | CoastDownProfile | SequenceProfile;

/** State of the rotor at one instant. */
interface RotorState {
  angle_deg: number;
  rate_deg_s: number;
}

/** Rest: angle held. */
function restState(angle0_deg: number): RotorState {
  return { angle_deg: angle0_deg, rate_deg_s: 0 };
}

/** First-order approach ω(t) = ω∞ + (ω0 − ω∞)e^{−t/τ} and its integral; t ≥ 0 since the phase began. */
function spinUpState(angle0_deg: number, rate0_deg_s: number, terminal_deg_s: number, tau_s: number, t_s: number): RotorState {
  const decay = Math.exp(-t_s / tau_s);
  // −expm1(−t/τ) = 1 − e^{−t/τ}, accurate for small t/τ
  const rise = -Math.expm1(-t_s / tau_s);
  return {
    angle_deg: angle0_deg + terminal_deg_s * t_s + (rate0_deg_s - terminal_deg_s) * tau_s * rise,
    rate_deg_s: terminal_deg_s + (rate0_deg_s - terminal_deg_s) * decay,
  };
}

/**
 * Coast-down under dω/dt = −c − kω (for ω > 0; mirrored for ω < 0) from rate ω0, t ≥ 0 since it began.
 * Closed form: ω = (ω0 + c/k)e^{−kt} − c/k, stopping at t* = ln(1 + kω0/c)/k; k = 0 gives ω = ω0 − ct.
 */
function coastDownState(angle0_deg: number, rate0_deg_s: number, c: number, k: number, t_s: number): RotorState {
  const sign = Math.sign(rate0_deg_s);
  const w0 = Math.abs(rate0_deg_s);
  if (w0 === 0) return restState(angle0_deg);
  const tStop = coastStopTime(w0, c, k);
  const t = Math.min(t_s, tStop);
  let w: number;
  let turned: number;
  if (k === 0) {
    w = w0 - c * t;
    turned = w0 * t - 0.5 * c * t * t;
  } else {
    const rise = -Math.expm1(-k * t); // 1 − e^{−kt}
    w = (w0 + c / k) * (1 - rise) - c / k;
    turned = ((w0 + c / k) * rise) / k - (c / k) * t;
  }
  if (t >= tStop) w = 0;
  return { angle_deg: angle0_deg + sign * turned, rate_deg_s: sign * Math.max(0, w) };
}

/** Time for a coast-down from |ω0| to stop, seconds (Infinity when there is no Coulomb friction). */
export function coastStopTime(w0_deg_s: number, coulomb_deg_s2: number, viscous_per_s: number): number {
  if (w0_deg_s <= 0) return 0;
  if (coulomb_deg_s2 <= 0) return Infinity;
  if (viscous_per_s === 0) return w0_deg_s / coulomb_deg_s2;
  return Math.log1p((viscous_per_s * w0_deg_s) / coulomb_deg_s2) / viscous_per_s;
}

/** Angle and rate of a profile at time t_s (closed forms; before any onset the rotor holds its start state). */
export function profileState(profile: RotationProfile, t_s: number): RotorState {
  switch (profile.kind) {
    case 'steady':
      return { angle_deg: profile.angle0_deg + profile.rate_deg_s * t_s, rate_deg_s: profile.rate_deg_s };
    case 'spinup':
      if (t_s <= profile.t0_s) return restState(profile.angle0_deg);
      return spinUpState(profile.angle0_deg, 0, profile.terminal_rate_deg_s, profile.tau_s, t_s - profile.t0_s);
    case 'coastdown':
      if (t_s <= profile.t0_s) {
        return { angle_deg: profile.angle0_deg + profile.start_rate_deg_s * t_s, rate_deg_s: profile.start_rate_deg_s };
      }
      return coastDownState(
        profile.angle0_deg + profile.start_rate_deg_s * profile.t0_s,
        profile.start_rate_deg_s,
        profile.coulomb_deg_s2,
        profile.viscous_per_s,
        t_s - profile.t0_s,
      );
    case 'sequence':
      return sequenceState(profile, t_s);
  }
}

/** Walks the phases, carrying angle and rate across each boundary. */
function sequenceState(profile: SequenceProfile, t_s: number): RotorState {
  let state: RotorState = restState(profile.angle0_deg);
  let start_s = 0;
  for (let i = 0; i < profile.phases.length; i++) {
    const phase = profile.phases[i];
    const last = i === profile.phases.length - 1;
    const local_s = Math.max(0, last ? t_s - start_s : Math.min(t_s - start_s, phase.duration_s));
    const next = phaseState(phase, state, local_s);
    if (last || t_s <= start_s + phase.duration_s) return next;
    state = next;
    start_s += phase.duration_s;
  }
  return state;
}

/** State `local_s` seconds into one phase that began in `entry`. */
function phaseState(phase: SequencePhase, entry: RotorState, local_s: number): RotorState {
  switch (phase.kind) {
    case 'rest':
      return restState(entry.angle_deg);
    case 'steady':
      return { angle_deg: entry.angle_deg + entry.rate_deg_s * local_s, rate_deg_s: entry.rate_deg_s };
    case 'spinup':
      return spinUpState(entry.angle_deg, entry.rate_deg_s, phase.terminal_rate_deg_s, phase.tau_s, local_s);
    case 'coastdown':
      return coastDownState(entry.angle_deg, entry.rate_deg_s, phase.coulomb_deg_s2, phase.viscous_per_s, local_s);
  }
}

/** Rotor angle at t_s, degrees, counterclockwise positive as seen in the displayed video (closed form). */
export function profileAngle(profile: RotationProfile, t_s: number): number {
  return profileState(profile, t_s).angle_deg;
}

/** Rotor rate at t_s, deg/s, counterclockwise positive (closed form, the derivative of profileAngle). */
export function profileRate(profile: RotationProfile, t_s: number): number {
  return profileState(profile, t_s).rate_deg_s;
}
