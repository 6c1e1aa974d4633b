/**
 * Why a fitted coast-down must not be chosen by --model auto, or undefined when it may be. The model is
 * dω/dt = −c·sign(ω) − k·ω (c Coulomb friction, deg/s²; k viscous, 1/s); a rotor without a drive only slows.
 * With c and k of opposite signs the curve has an equilibrium speed s* = −c/k: a fit whose s* lies within a
 * factor 2 of the initial speed holds a steady nonzero rate for a while, which needs a drive (with k < 0 the
 * negative viscous term is then a drive cancelling most of the friction; with c < 0 the curve settles at s*).
 * The factor 2 is a choice of ours, no source.
 * @param upper_ci upper ends of the parameters' intervals (a coefficient clearly below zero is not physical)
 */
export function coastDownNotEligible(
  fit: { initial_rate_deg_s: number; coulomb_deg_s2: number; viscous_per_s: number },
  upper_ci: { coulomb_deg_s2: number; viscous_per_s: number },
): string | undefined {
  const c = fit.coulomb_deg_s2;
  const k = fit.viscous_per_s;
  const s0 = Math.abs(fit.initial_rate_deg_s);
  if (c + k * s0 < 0) return 'the fitted rotor gains speed, which a coast-down cannot do';
  if (upper_ci.coulomb_deg_s2 < 0 || upper_ci.viscous_per_s < 0) return 'a friction coefficient is clearly negative, which is not physical';
  if (c * k < 0) {
    const equilibrium = -c / k;
    if (equilibrium > 0.5 * s0 && equilibrium < 2 * s0) return 'the fitted curve holds a steady nonzero rate, which needs a drive, not a coast-down';
  }
  return undefined;
}
