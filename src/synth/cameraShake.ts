import type { SynthSpec } from './SynthSpec.js';
import { seededRandom } from './seededRandom.js';
import type { ShakeState } from './viewTransform.js';
import { NO_SHAKE } from './viewTransform.js';

/** Random stream number reserved for camera shake. */
const SHAKE_STREAM = 202;
/** Sinusoids per shake component. */
const TERMS = 6;

interface Wave {
  amplitude: number;
  omega_rad_s: number;
  phase_rad: number;
}

/** Sum of TERMS sinusoids with seeded frequencies in [0.1, 1]·bandwidth and phases, scaled to the given rms. */
function smoothRandom(rms: number, bandwidth_hz: number, next: () => number): Wave[] {
  const amplitude = rms * Math.sqrt(2 / TERMS);
  return Array.from({ length: TERMS }, () => ({
    amplitude,
    omega_rad_s: 2 * Math.PI * bandwidth_hz * (0.1 + 0.9 * next()),
    phase_rad: 2 * Math.PI * next(),
  }));
}

function evaluate(waves: Wave[], t_s: number): number {
  let sum = 0;
  for (const w of waves) sum += w.amplitude * Math.sin(w.omega_rad_s * t_s + w.phase_rad);
  return sum;
}

/**
 * Smooth seeded camera shake: translation in x and y with the given rms (px) each and rotation about the
 * frame centre with the given rms (deg), band-limited to bandwidth_hz. Returns a function of time.
 */
export function createCameraShake(spec: Pick<SynthSpec, 'seed' | 'realism'>): (t_s: number) => ShakeState {
  const { translation_px, rotation_deg, bandwidth_hz } = spec.realism.shake;
  if (translation_px === 0 && rotation_deg === 0) return () => NO_SHAKE;
  const random = seededRandom(spec.seed, SHAKE_STREAM);
  const next = (): number => random.uniform();
  const xs = smoothRandom(translation_px, bandwidth_hz, next);
  const ys = smoothRandom(translation_px, bandwidth_hz, next);
  const rs = smoothRandom(rotation_deg, bandwidth_hz, next);
  return (t_s) => ({ dx_px: evaluate(xs, t_s), dy_px: evaluate(ys, t_s), rotation_deg: evaluate(rs, t_s) });
}
