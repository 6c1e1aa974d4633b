// Types of bench/fitScenarios.mjs (seeded synthetic angle series for the steady-fit coverage checks).
export interface SteadySimulation {
  seed: number;
  n: number;
  fps?: number;
  t0_s?: number;
  rate_deg_s: number;
  white_deg?: number;
  ar_phi?: number;
  ar_sd_deg?: number;
  walk_deg_sqrt_s?: number;
  lost_share?: number;
}
export function normalSource(seed: number): () => number;
export function simulateSteady(o: SteadySimulation): { t_s: Float64Array; angle_deg: Float64Array };
export const SCENARIOS: { name: string; noise: Omit<SteadySimulation, 'seed' | 'n' | 'rate_deg_s'> }[];
export const SMALL_WANDER_SCENARIOS: { name: string; noise: Omit<SteadySimulation, 'seed' | 'n' | 'rate_deg_s'> }[];
