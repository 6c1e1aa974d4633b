import { describe, expect, it } from 'vitest';
import { coastStopTime, profileAngle, profileRate } from '../../src/synth/rotationProfile.js';
import type { RotationProfile } from '../../src/synth/rotationProfile.js';

/**
 * Classical fourth-order Runge–Kutta for the state (θ, ω) under dθ/dt = ω, dω/dt = accel(t, ω)
 * (reference: Press et al., Numerical Recipes, 3rd ed., §17.1, eq. 17.1.3). Written here, independent of the code under test.
 */
function rk4(accel: (t: number, w: number) => number, theta0: number, w0: number, t0: number, t1: number, steps: number): { theta: number; w: number } {
  let theta = theta0;
  let w = w0;
  const h = (t1 - t0) / steps;
  for (let i = 0; i < steps; i++) {
    const t = t0 + i * h;
    const k1t = w, k1w = accel(t, w);
    const k2t = w + (h / 2) * k1w, k2w = accel(t + h / 2, w + (h / 2) * k1w);
    const k3t = w + (h / 2) * k2w, k3w = accel(t + h / 2, w + (h / 2) * k2w);
    const k4t = w + h * k3w, k4w = accel(t + h, w + h * k3w);
    theta += (h / 6) * (k1t + 2 * k2t + 2 * k3t + k4t);
    w += (h / 6) * (k1w + 2 * k2w + 2 * k3w + k4w);
  }
  return { theta, w };
}

/** Central difference of profileAngle, deg/s. */
function numericRate(p: RotationProfile, t: number, h = 1e-5): number {
  return (profileAngle(p, t + h) - profileAngle(p, t - h)) / (2 * h);
}

describe('steady profile', () => {
  it('turns at the given rate, including tiny rates of either sign', () => {
    for (const rate of [90, -3.5, 0.002, -0.0007]) {
      const p: RotationProfile = { kind: 'steady', angle0_deg: 12, rate_deg_s: rate };
      // θ = θ0 + ωt (uniform rotation, common practice, no source)
      expect(profileAngle(p, 7.25)).toBeCloseTo(12 + rate * 7.25, 10);
      expect(profileRate(p, 3)).toBe(rate);
    }
  });
});

describe('spin-up profile', () => {
  const p: RotationProfile = { kind: 'spinup', angle0_deg: 5, t0_s: 0.4, terminal_rate_deg_s: 720, tau_s: 0.35 };

  it('matches the closed form θ0 + ω∞[(t−t0) − τ(1 − e^{−(t−t0)/τ})] and is at rest before onset', () => {
    // solution of the first-order linear ODE τ dω/dt = ω∞ − ω from rest (e.g. Boyce & DiPrima, Elementary
    // Differential Equations, §2.1; formula from memory), integrated once for θ
    for (const t of [0, 0.2, 0.4, 0.41, 0.75, 1.3, 3]) {
      const d = Math.max(0, t - 0.4);
      const expected = 5 + 720 * (d - 0.35 * (1 - Math.exp(-d / 0.35)));
      expect(profileAngle(p, t)).toBeCloseTo(expected, 9);
    }
  });

  it('agrees with an RK4 integration of its ODE and with its own derivative', () => {
    const ref = rk4((_t, w) => (720 - w) / 0.35, 5, 0, 0.4, 2.4, 4000);
    expect(profileAngle(p, 2.4)).toBeCloseTo(ref.theta, 6);
    expect(profileRate(p, 2.4)).toBeCloseTo(ref.w, 6);
    for (const t of [0.6, 1, 2]) expect(profileRate(p, t)).toBeCloseTo(numericRate(p, t), 4);
  });

  it('spins the other way for a negative terminal rate', () => {
    const q: RotationProfile = { ...p, terminal_rate_deg_s: -720 };
    // the same closed form with ω∞ = −720 deg/s (see above), at t = 1.5 s
    const d = 1.5 - 0.4;
    expect(profileAngle(q, 1.5)).toBeCloseTo(5 - 720 * (d - 0.35 * (1 - Math.exp(-d / 0.35))), 9);
    expect(profileRate(q, 1.5)).toBeCloseTo(-720 * (1 - Math.exp(-d / 0.35)), 9);
  });
});

describe('coast-down profile', () => {
  const c = 90;
  const k = 0.8;
  const p: RotationProfile = { kind: 'coastdown', angle0_deg: 0, t0_s: 0.25, start_rate_deg_s: 400, coulomb_deg_s2: c, viscous_per_s: k };

  it('agrees with an RK4 integration of dω/dt = −c − kω up to the stop, then stays stopped', () => {
    const tStop = coastStopTime(400, c, k);
    // dω/dt = −c − kω separates to ln((ω0 + c/k)/(ω + c/k)) = kt, so ω reaches 0 at ln(1 + kω0/c)/k (worked by hand)
    expect(tStop).toBeCloseTo(Math.log(1 + (k * 400) / c) / k, 12);
    const before = 400 * 0.25;
    const ref = rk4((_t, w) => -c - k * w, before, 400, 0.25, 0.25 + tStop, 20000);
    expect(ref.w).toBeCloseTo(0, 6);
    expect(profileAngle(p, 0.25 + tStop)).toBeCloseTo(ref.theta, 6);
    const mid = rk4((_t, w) => -c - k * w, before, 400, 0.25, 1.5, 20000);
    expect(profileAngle(p, 1.5)).toBeCloseTo(mid.theta, 6);
    expect(profileRate(p, 1.5)).toBeCloseTo(mid.w, 6);
    expect(profileRate(p, 0.25 + tStop + 1)).toBe(0);
    expect(profileAngle(p, 0.25 + tStop + 5)).toBeCloseTo(ref.theta, 6);
  });

  it('reduces to uniform deceleration without viscous friction and to exponential decay without Coulomb friction', () => {
    // uniform deceleration: θ = ω0 t − c t²/2 until t = ω0/c (constant-acceleration kinematics, common practice, no source)
    const q: RotationProfile = { kind: 'coastdown', angle0_deg: 0, t0_s: 0, start_rate_deg_s: 300, coulomb_deg_s2: 100, viscous_per_s: 0 };
    expect(profileAngle(q, 2)).toBeCloseTo(300 * 2 - 50 * 4, 9);
    expect(profileAngle(q, 9)).toBeCloseTo(300 * 3 - 50 * 9, 9);
    // pure viscous: ω = ω0 e^{−kt}, θ = ω0(1 − e^{−kt})/k, never stops (first-order linear decay, common practice, no source)
    const v: RotationProfile = { kind: 'coastdown', angle0_deg: 0, t0_s: 0, start_rate_deg_s: 300, coulomb_deg_s2: 0, viscous_per_s: 0.5 };
    expect(profileAngle(v, 3)).toBeCloseTo((300 * (1 - Math.exp(-1.5))) / 0.5, 9);
    expect(profileRate(v, 30)).toBeGreaterThan(0);
  });

  it('mirrors for a negative start rate and matches its derivative', () => {
    const q: RotationProfile = { ...p, start_rate_deg_s: -400 };
    // friction opposes the motion: dω/dt = +c − kω while ω < 0, integrated by the RK4 above
    const before = -400 * 0.25;
    const at1 = rk4((_t, w) => c - k * w, before, -400, 0.25, 1, 20000);
    const at2 = rk4((_t, w) => c - k * w, before, -400, 0.25, 2, 20000);
    expect(at2.w).toBeLessThan(0); // still turning at 2 s (it stops at 0.25 + ln(1 + kω0/c)/k ≈ 2.15 s)
    expect(profileAngle(q, 2)).toBeCloseTo(at2.theta, 6);
    expect(profileRate(q, 1)).toBeCloseTo(at1.w, 6);
    // internal consistency: the rate is the derivative of the angle (central difference of profileAngle)
    for (const t of [0.1, 0.5, 1.2]) expect(profileRate(p, t)).toBeCloseTo(numericRate(p, t), 3);
  });
});

describe('sequence profile', () => {
  const p: RotationProfile = {
    kind: 'sequence',
    angle0_deg: 30,
    phases: [
      { kind: 'rest', duration_s: 0.5 },
      { kind: 'spinup', duration_s: 1.2, terminal_rate_deg_s: 500, tau_s: 0.4 },
      { kind: 'steady', duration_s: 0.8 },
      { kind: 'coastdown', duration_s: 1, coulomb_deg_s2: 150, viscous_per_s: 0.6 },
    ],
  };
  const bounds = [0.5, 1.7, 2.5];

  // internal consistency (no outside value): angle and rate do not jump where one phase hands over to the next
  it('is continuous in angle and rate at every phase boundary', () => {
    for (const b of bounds) {
      const eps = 1e-7;
      expect(Math.abs(profileAngle(p, b + eps) - profileAngle(p, b - eps))).toBeLessThan(1e-3);
      expect(Math.abs(profileRate(p, b + eps) - profileRate(p, b - eps))).toBeLessThan(1e-3);
    }
  });

  it('agrees with one RK4 integration of the piecewise ODE across all phases', () => {
    // one right-hand side per phase, so no RK4 stage evaluates the next phase's law
    const spinUp = (_t: number, w: number): number => (500 - w) / 0.4;
    const steady = (): number => 0;
    const coast = (_t: number, w: number): number => (w > 0 ? -150 - 0.6 * w : 0);
    let s = rk4(spinUp, 30, 0, 0.5, 1.7, 6000);
    expect(profileAngle(p, 1.7)).toBeCloseTo(s.theta, 6);
    s = rk4(steady, s.theta, s.w, 1.7, 2.5, 2000);
    expect(profileAngle(p, 2.5)).toBeCloseTo(s.theta, 6);
    const tStop = Math.log(1 + (0.6 * s.w) / 150) / 0.6;
    const end = rk4(coast, s.theta, s.w, 2.5, 2.5 + tStop, 20000);
    expect(profileAngle(p, 2.5 + tStop)).toBeCloseTo(end.theta, 5);
    expect(profileAngle(p, 9)).toBeCloseTo(end.theta, 5);
    expect(profileRate(p, 9)).toBe(0);
  });
});
