import { robustSpread } from './robustSpread.js';

/** Areas kept for the steady-size check, which starts once this many are known. */
export const AREA_HISTORY = 15;
/** The steady-size band: this many robust SDs of the recent areas (1.4826 × MAD; common practice, no source)… */
const AREA_SIGMAS = 5;
/** …but never narrower than this share of the typical area or AREA_MIN_BAND_PX (compression and noise move a small spot's edge pixels). */
const AREA_MIN_BAND_SHARE = 0.25;
const AREA_MIN_BAND_PX = 6;

/** How far a spot's area may lie from the typical (upper median) area of a marker whose size has kept steady over `areas`, px. */
export function steadySizeBand(areas: readonly number[]): number {
  const { median, sigma } = robustSpread(areas);
  return Math.max(AREA_MIN_BAND_PX, AREA_MIN_BAND_SHARE * median, AREA_SIGMAS * sigma);
}
