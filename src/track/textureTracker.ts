import { InputError } from '../errors.js';
import { CircularShiftEstimator, type RowSpectra } from './circularShift.js';
import { createPolarGrid, polarUnwrap, type GrayCrop, type PolarGrid } from './polarUnwrap.js';
import { refineTextureCentre } from './textureCentre.js';
import { applyRowWeights, outlierWeights, shiftRowWeights } from './textureOutlierWeights.js';
import { upperMedian } from './robustSpread.js';

export type { GrayCrop } from './polarUnwrap.js';

export interface TextureTrackerOptions {
  /** Rotation centre of the hub, full-frame px. */
  centre: { x_px: number; y_px: number };
  /** Inner radius of the textured annulus, px (keep the axle and its glare out). */
  r_inner_px: number;
  /** Outer radius of the textured annulus, px (keep the still background out). */
  r_outer_px: number;
  /** Angle samples around the circle; rounded up to a power of two. Default: the power of two ≥ 2π·r_outer_px, within 256..8192. */
  angular_bins?: number;
  /** Start a new reference after the hub has turned this far from the current one, deg. Default Infinity (only on a quality drop). */
  reference_refresh_deg?: number;
  /** Correlation under which the tracker looks for a better reference or makes the current frame one. Default 0.8. */
  refresh_below?: number;
  /**
   * Correlation under which outliers (bubbles, glare) are looked for and masked, and the shift measured
   * again; it is also looked for when a frame's correlation falls 0.005 below the median of the last 15
   * frames (noise and compression lower every frame's correlation alike). Default 0.995.
   */
  robust_below?: number;
  /** Successive frames below refresh_below before the current frame becomes a new reference (a passing bubble should not). Default 5. */
  refresh_after_frames?: number;
  /** Correlation under which a frame is reported lost (NaN, quality 0). Default 0.6. */
  min_quality?: number;
  /** Largest change of angle between two successive frames beyond the constant-rate prediction, deg. Default 90. */
  max_step_deg?: number;
  /** References kept for re-use (the first frame is always kept). Default 8. */
  max_references?: number;
  /**
   * Refine the centre from the texture itself once the hub has turned far enough (a centre off by 0.1 px
   * costs up to about 0.04° on a 60 px annulus). Default true.
   */
  refine_centre?: boolean;
  /** Turned angles (deg from the first frame) at which the centre is refined, each once. Default [20, 60, 150]. */
  refine_centre_at_deg?: number[];
}

/** One frame's reading: cumulative rotation since the first frame, deg, counterclockwise positive as displayed. */
export interface TextureReading {
  angle_deg: number;
  /** Normalised correlation with the reference used, 0..1; 0 with a NaN angle when the frame could not be read. */
  quality: number;
}

export interface TextureTracker {
  /**
   * Reads the hub's rotation in the next frame. `offset` moves the annulus centre for this frame only
   * (e.g. by the camera shift an anchor measured), px.
   */
  update(frame: GrayCrop, offset?: { dx_px: number; dy_px: number }): TextureReading;
  /** References made so far, the first frame's included (a diagnostic: each new one may add a small step error). */
  readonly references_made: number;
  /** The rotation centre in use (given, or refined from the texture), full-frame px, without any per-frame offset. */
  readonly centre_px: { x_px: number; y_px: number };
  /** How many times the centre was refined from the texture. */
  readonly centre_refinements: number;
}

interface Reference {
  polar: Float64Array;
  spectra: RowSpectra;
  angle_deg: number;
}

/** A frame's unwrapped annulus and the spectra of its rows. */
interface Unwrapped {
  polar: Float64Array;
  spectra: RowSpectra;
}

/** Smallest power of two ≥ n. */
function nextPowerOfTwo(n: number): number {
  let p = 4;
  while (p < n) p *= 2;
  return p;
}

/** Wraps an angle to (−180, 180], deg. */
function wrapDeg(a: number): number {
  return a - 360 * Math.ceil((a - 180) / 360);
}

/**
 * Tracks the rotation of a hub with no marker by its own texture: the annulus around the centre is
 * unwrapped to polar form (bilinear sampling), each radius row is mean-removed, and the circular shift
 * against a reference frame is found by FFT cross-correlation summed over rows and normalised by the
 * rows' energy (so lighting gain and offset drop out), refined below one bin (parabolic fit, then
 * Newton steps on the Fourier interpolant).
 *
 * Outliers: when the correlation drops (see robust_below), samples that do not turn with the hub (a
 * bubble, glare) are given Tukey weights of 0 (textureOutlierWeights), both images are masked alike and
 * the shift is measured again until it settles; the reported quality stays the unmasked correlation.
 * A frame with a masked part never becomes a reference.
 *
 * References (keyframe chain, so errors do not random-walk frame by frame): the first frame stays the
 * reference while its correlation is at least refresh_below. When it drops, every kept reference is
 * tried and the best one used; only if none reaches refresh_below for refresh_after_frames frames in a
 * row (a lasting change of appearance, not a passing bubble) does the current frame become a new
 * reference, its angle measured against the best one. A later frame goes back to the first frame as
 * soon as it correlates well again, so a passing bubble adds no lasting error.
 *
 * Centre: an annulus sampled around a wrong centre is not a pure circular shift of the reference, so
 * the given centre is refined from the texture (refineTextureCentre: rigid registration of the first
 * frame onto a frame turned by 20°, 60° and 150°, the motion's fixed point); after each refinement the
 * first frame, unwrapped around the new centre, becomes the only reference again.
 *
 * The cumulative angle is unwrapped against a constant-rate
 * prediction from the last two good frames.
 */
export function createTextureTracker(options: TextureTrackerOptions): TextureTracker {
  const { centre, r_inner_px, r_outer_px } = options;
  if (!Number.isFinite(centre?.x_px) || !Number.isFinite(centre?.y_px)) {
    throw new InputError('the texture tracker needs a rotation centre with finite x and y in px; give --centre x,y');
  }
  const requestedBins = options.angular_bins ?? Math.min(8192, Math.max(256, Math.ceil(2 * Math.PI * r_outer_px)));
  if (!(requestedBins >= 8 && requestedBins <= 65536)) {
    throw new InputError(`the texture tracker needs 8 to 65536 angle samples, got ${requestedBins}; give a number in that range`);
  }
  const bins = nextPowerOfTwo(requestedBins);
  const grid: PolarGrid = createPolarGrid({ r_inner_px, r_outer_px, angular_bins: bins });
  const estimator = new CircularShiftEstimator(bins);
  const degPerBin = 360 / bins;
  const refreshDeg = options.reference_refresh_deg ?? Infinity;
  const refreshBelow = options.refresh_below ?? 0.8;
  const minQuality = options.min_quality ?? 0.6;
  const robustBelow = options.robust_below ?? 0.995;
  const rows = grid.radii_px.length;
  const refreshAfter = Math.max(1, Math.round(options.refresh_after_frames ?? 5));
  const maxStepDeg = Math.min(180, options.max_step_deg ?? 90);
  const maxReferences = Math.max(2, options.max_references ?? 8);

  const refineCentre = options.refine_centre ?? true;
  const refineAt = [...(options.refine_centre_at_deg ?? [20, 60, 150])].sort((a, b) => a - b);
  const maxCentreMove = 2 + 0.1 * r_outer_px;
  let nextRefine = 0;
  let refineTries = 0;
  let refinements = 0;
  const base = { x_px: centre.x_px, y_px: centre.y_px };
  let first: { frame: GrayCrop; dx_px: number; dy_px: number } | null = null;

  const references: Reference[] = [];
  let active = 0;
  let made = 0;
  let lastAngle = Number.NaN;
  let lastStep = 0;
  let framesSinceGood = 0;
  let framesBelow = 0;
  const recentQuality: number[] = [];

  const measure = (ref: Reference, cur: Unwrapped, predicted_deg: number, robust: boolean): { angle_deg: number; quality: number; masked_share: number } => {
    const predictedShift = wrapDeg(predicted_deg - ref.angle_deg);
    const est = estimator.estimate(ref.spectra, cur.spectra, {
      predicted_bins: predictedShift / degPerBin,
      window_bins: maxStepDeg / degPerBin,
    });
    if (!Number.isFinite(est.shift_bins)) return { angle_deg: Number.NaN, quality: 0, masked_share: 1 };
    let shift = est.shift_bins;
    let masked = 0;
    if (robust && est.correlation < robustBelow && est.correlation >= minQuality) {
      // Mask what does not turn with the hub (Tukey weights on the residual) and measure again, until it settles.
      let w = outlierWeights(cur.polar, ref.polar, rows, bins, shift);
      for (let pass = 0; pass < 5; pass++) {
        const share = w.reduce((n, v) => n + (v < 0.5 ? 1 : 0), 0) / w.length;
        if (share < 0.002) break; // nothing stands out: the plain estimate stands
        const curMasked = estimator.spectra(applyRowWeights(cur.polar, w, rows, bins), rows);
        const refMasked = estimator.spectra(applyRowWeights(ref.polar, shiftRowWeights(w, rows, bins, shift), rows, bins), rows);
        const again = estimator.estimate(refMasked, curMasked, { predicted_bins: shift, window_bins: 2 });
        if (!Number.isFinite(again.shift_bins) || again.correlation < est.correlation) break;
        const step = Math.abs(again.shift_bins - shift);
        shift = again.shift_bins;
        masked = share;
        if (step < 1e-3) break;
        w = outlierWeights(cur.polar, ref.polar, rows, bins, shift);
      }
    }
    const shiftDeg = shift * degPerBin;
    // Choose the turn count that puts the reading nearest the prediction.
    const turns = Math.round((predicted_deg - ref.angle_deg - shiftDeg) / 360);
    return { angle_deg: ref.angle_deg + shiftDeg + 360 * turns, quality: Math.max(0, est.correlation), masked_share: masked };
  };

  const addReference = (frame: Unwrapped, angle_deg: number): void => {
    if (references.length >= maxReferences) references.splice(1, 1); // keep the first frame, drop the oldest other
    references.push({ polar: frame.polar, spectra: frame.spectra, angle_deg });
    active = references.length - 1;
    made++;
  };

  return {
    get references_made() {
      return made;
    },
    get centre_px() {
      return { ...base };
    },
    get centre_refinements() {
      return refinements;
    },
    update(frame: GrayCrop, offset?: { dx_px: number; dy_px: number }): TextureReading {
      const dx = offset?.dx_px ?? 0;
      const dy = offset?.dy_px ?? 0;
      if (!Number.isFinite(dx) || !Number.isFinite(dy)) return { angle_deg: Number.NaN, quality: 0 };
      const unwrap = (f: GrayCrop, ox: number, oy: number): Unwrapped => {
        const polar = polarUnwrap(f, grid, { x_px: base.x_px + ox, y_px: base.y_px + oy });
        return { polar, spectra: estimator.spectra(polar, rows) };
      };
      let current = unwrap(frame, dx, dy);
      if (references.length === 0) {
        if (!(current.spectra.energy > 0)) return { angle_deg: Number.NaN, quality: 0 };
        if (refineCentre) first = { frame: { ...frame, data: frame.data.slice() }, dx_px: dx, dy_px: dy };
        addReference(current, 0);
        lastAngle = 0;
        lastStep = 0;
        framesSinceGood = 0;
        return { angle_deg: 0, quality: 1 };
      }
      framesSinceGood++;
      const predicted = lastAngle + lastStep * framesSinceGood;
      // Choose the reference on plain correlations; mask outliers only against the one chosen.
      let best = measure(references[active], current, predicted, false);
      let bestIndex = active;
      if (best.quality < refreshBelow) {
        // Try every kept reference, the first frame first.
        for (let i = 0; i < references.length; i++) {
          if (i === active) continue;
          const m = measure(references[i], current, predicted, false);
          if (m.quality > best.quality) {
            best = m;
            bestIndex = i;
          }
        }
      } else if (active !== 0 && !Number.isFinite(refreshDeg)) {
        // Go back to the first frame as soon as it matches well again.
        const root = measure(references[0], current, predicted, false);
        if (root.quality >= refreshBelow) {
          best = root;
          bestIndex = 0;
        }
      }
      if (!(best.quality >= minQuality) || !Number.isFinite(best.angle_deg)) return { angle_deg: Number.NaN, quality: 0 };
      active = bestIndex;
      const typical = recentQuality.length >= 5 ? upperMedian(recentQuality) : 1;
      recentQuality.push(best.quality);
      if (recentQuality.length > 15) recentQuality.shift();
      if (best.quality < Math.min(robustBelow, typical - 0.005)) best = measure(references[active], current, predicted, true);
      if (first && nextRefine < refineAt.length && best.quality >= refreshBelow && Math.abs(best.angle_deg) >= refineAt[nextRefine]) {
        // Refine the centre from the first frame and this one, then restart from the first frame as the only reference.
        const found = refineTextureCentre(first.frame, frame, {
          centre: { x_px: base.x_px + first.dx_px, y_px: base.y_px + first.dy_px },
          r_inner_px,
          r_outer_px,
          angle_deg: best.angle_deg,
          offset: { dx_px: dx - first.dx_px, dy_px: dy - first.dy_px },
        });
        const moved = found ? Math.hypot(found.x_px - first.dx_px - base.x_px, found.y_px - first.dy_px - base.y_px) : Infinity;
        if (found && found.correlation >= refreshBelow && moved <= maxCentreMove) {
          base.x_px = found.x_px - first.dx_px;
          base.y_px = found.y_px - first.dy_px;
          references.length = 0;
          addReference(unwrap(first.frame, first.dx_px, first.dy_px), 0);
          current = unwrap(frame, dx, dy);
          const again = measure(references[0], current, best.angle_deg, true);
          if (again.quality >= minQuality && Number.isFinite(again.angle_deg)) best = again;
          active = 0;
          refinements++;
          nextRefine++;
          refineTries = 0;
        } else if (++refineTries >= 3) {
          nextRefine++;
          refineTries = 0;
        }
      }
      framesBelow = best.quality < refreshBelow ? framesBelow + 1 : 0;
      // A frame with part of the ring masked (a bubble on it) never becomes a reference.
      if ((framesBelow >= refreshAfter && best.masked_share < 0.02) || Math.abs(best.angle_deg - references[active].angle_deg) > refreshDeg) {
        addReference(current, best.angle_deg);
        framesBelow = 0;
      }
      lastStep = (best.angle_deg - lastAngle) / framesSinceGood;
      lastAngle = best.angle_deg;
      framesSinceGood = 0;
      return { angle_deg: best.angle_deg, quality: best.quality };
    },
  };
}
