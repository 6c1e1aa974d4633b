import { findSpots, type Spot, type Window } from './findSpots.js';
import { robustSpread } from './robustSpread.js';
import { wrapDeg } from './rotorPlaneAngle.js';
import { createSpotFollower, type SpotFollower, type SpotReading } from './spotFollower.js';

/** Frames a lost marker's extrapolated place is still blanked for the other followers. */
const MAX_BLANK_AGE = 5;
/** With a known centre and more spots than markers at the start: frames every spot is followed before the markers are chosen… */
const CHOOSE_AFTER = 20;
/** …of at most this many spots (the biggest). */
const MOST_CANDIDATES = 6;

export interface FollowMarkersOptions {
  /** Where the markers may be, in signal-image pixels. */
  region: Window;
  /** Number of markers on the hub (2 or more). */
  count: number;
  /** The rotation centre when known beforehand (--center), signal-image px: each marker is held to its own distance from it (see createSpotFollower). */
  centre?: { x_px: number; y_px: number };
}

/** A spot followed while the markers are chosen: its follower, distances from the centre, turn about it and last reading. */
interface Candidate {
  follower: SpotFollower;
  radii: number[];
  /** Unwrapped angle travelled about the centre (deg, counterclockwise as displayed) between the first and last kept reading, at times first_t and t (s). */
  turn: { first_t: number; t: number; angle: number; travel: number };
  last: SpotReading | null;
  seen: number;
}

/** Angular rate (deg/s) below which a candidate counts as standing still over the choosing window. */
const STILL_DEG_S = 3;

/**
 * The `count` candidates that turn together about the centre: among the sets of `count` candidates at least 4 px
 * apart: first the sets that move (mean |rate| ≥ STILL_DEG_S) with angular rates (deg/s) that agree within noise — a
 * still spot next to turning markers is left out, and so is a particle, which drifts at its own rate — then the
 * rest; within either class the steadiest distances from the centre decide (a particle drifting past changes its
 * distance). A hub that barely turns over the window (a slow run) thus falls to the steadiest distances, where a
 * moving particle does not win by moving. Null when no such set exists.
 */
export function pickTurningTogether<C extends { radii: number[]; turn: { first_t: number; t: number; travel: number }; last: SpotReading }>(candidates: C[], count: number): C[] | null {
  const rate = (c: C): number => (c.turn.t > c.turn.first_t ? c.turn.travel / (c.turn.t - c.turn.first_t) : 0);
  const spread = (c: C): number => robustSpread(c.radii).sigma;
  let best: { set: C[]; together: boolean; steadiness: number } | null = null;
  const consider = (set: C[]): void => {
    for (let a = 0; a < set.length; a++) for (let b = a + 1; b < set.length; b++) if (Math.hypot(set[a]!.last.x_px - set[b]!.last.x_px, set[a]!.last.y_px - set[b]!.last.y_px) <= 4) return;
    const rates = set.map(rate);
    const moving = rates.reduce((s, r) => s + Math.abs(r), 0) / rates.length >= STILL_DEG_S;
    const range = Math.max(...rates) - Math.min(...rates);
    const steadiness = set.reduce((s, c) => s + spread(c), 0);
    // rates that agree within noise (2 deg/s, or a tenth of the rate) count as turning together; a set that moves and
    // turns together comes first, and within either class the steadier distances from the centre decide
    const together = moving && range <= Math.max(2, 0.1 * Math.max(...rates.map(Math.abs)));
    const better = !best || (together !== best.together ? together : steadiness < best.steadiness);
    if (better) best = { set, together, steadiness };
  };
  const pick = (from: number, set: C[]): void => {
    if (set.length === count) { consider(set); return; }
    for (let i = from; i < candidates.length; i++) pick(i + 1, [...set, candidates[i]!]);
  };
  pick(0, []);
  return best ? (best as { set: C[] }).set : null;
}

/**
 * Follows several marker spots on one hub, each with its own spot follower (own prediction and gate).
 * Until all `count` markers are seen in one frame, nothing is followed (every marker `lost:no-blob`). With a known
 * centre and more spots than markers in that frame, the markers are chosen by following every spot for a while
 * (choose). Otherwise, at that frame the `count` biggest spots (findSpots; spots crossing the region's edge last) are numbered counterclockwise as displayed from the image's +x
 * direction about their mean position, and each follower is started on its own spot (its first search takes the spot nearest it; the others are blanked). Every frame, each
 * follower sees the signal with the other markers blanked out (a disc around their latest or extrapolated
 * position, for up to MAX_BLANK_AGE lost frames, filled with the region's median), so it can neither start on, reacquire nor drift onto another
 * marker. A reading that still lands on a spot another marker took this frame is refused (`lost:gate`).
 * Positions are in signal-image pixels; a lost marker has NaN position and a reason in flag.
 */
export function createMarkerFollowers(options: FollowMarkersOptions) {
  const { region, count } = options;
  const followers: SpotFollower[] = [];
  /** Last found position, the step per frame before it, frames since it, spot radius: per marker, px. */
  const last: { x: number; y: number; dx: number; dy: number; age: number; r: number }[] = [];
  let scratch: Uint8Array | null = null;

  /** Median of the signal over the region, signal units. */
  const regionMedian = (signal: Uint8Array, width: number): number => {
    const hist = new Uint32Array(256);
    for (let y = region.y0; y < region.y1; y++) for (let x = region.x0, i = y * width + x; x < region.x1; x++, i++) hist[signal[i]]++;
    const half = ((region.x1 - region.x0) * (region.y1 - region.y0)) / 2;
    let c = 0;
    for (let v = 0; v < 256; v++) if ((c += hist[v]) >= half) return v;
    return 255;
  };

  /** Fills a disc of the scratch image with `value` (clipped to the region). */
  const blank = (img: Uint8Array, width: number, cx: number, cy: number, radius: number, value: number): void => {
    const y0 = Math.max(region.y0, Math.floor(cy - radius));
    const y1 = Math.min(region.y1 - 1, Math.ceil(cy + radius));
    const x0 = Math.max(region.x0, Math.floor(cx - radius));
    const x1 = Math.min(region.x1 - 1, Math.ceil(cx + radius));
    const r2 = radius * radius;
    for (let y = y0; y <= y1; y++) for (let x = x0; x <= x1; x++) if ((x - cx) ** 2 + (y - cy) ** 2 <= r2) img[y * width + x] = value;
  };

  /** Spots being followed while the markers are chosen among them (a known centre and more spots than markers at the start). */
  let candidates: Candidate[] | null = null;
  let candidateFrames = 0;
  /** True on the frame the markers were chosen: the followers have already measured it, so it is not measured again. */
  let justChosen = false;

  /**
   * Takes these followers on as the markers, each at its spot (position and area, px), numbered counterclockwise as
   * displayed from the image's +x direction about their mean position.
   */
  const adopt = (spots: { follower: SpotFollower; x_px: number; y_px: number; area_px: number }[]): void => {
    const mx = spots.reduce((s, p) => s + p.x_px, 0) / spots.length;
    const my = spots.reduce((s, p) => s + p.y_px, 0) / spots.length;
    const polar = (p: { x_px: number; y_px: number }): number => {
      const a = Math.atan2(-(p.y_px - my), p.x_px - mx);
      return a < 0 ? a + 2 * Math.PI : a;
    };
    for (const p of [...spots].sort((a, b) => polar(a) - polar(b))) {
      followers.push(p.follower);
      last.push({ x: p.x_px, y: p.y_px, dx: 0, dy: 0, age: 0, r: Math.sqrt(Math.max(4, p.area_px) / Math.PI) });
    }
  };

  /**
   * At a start with more spots than markers about a known centre, nothing yet tells the markers from a particle (often
   * the bigger spot) or a still spot (a bolt head, a reflection): every spot is followed for CHOOSE_AFTER frames. The
   * markers of one hub turn together: among the spots found in at least half those frames, the `count` whose angular
   * rates about the centre agree best are taken (pickTurningTogether); those frames are lost for the markers.
   * Returns true once the markers are chosen.
   */
  const choose = (signal: Uint8Array, width: number, t_s: number, centre: { x_px: number; y_px: number }, found: Spot[] | null): boolean => {
    if (!candidates) {
      candidates = found!.slice(0, MOST_CANDIDATES).map((s) => ({ follower: createSpotFollower({ region, start: { x_px: s.x_px, y_px: s.y_px }, centre }), radii: [], turn: { first_t: NaN, t: NaN, angle: NaN, travel: 0 }, last: null, seen: 0 }));
      candidateFrames = 0;
    }
    for (const c of candidates) {
      const r = c.follower.update(signal, width, t_s);
      if (r.flag !== '') continue;
      c.radii.push(Math.hypot(r.x_px - centre.x_px, r.y_px - centre.y_px));
      const angle = (Math.atan2(-(r.y_px - centre.y_px), r.x_px - centre.x_px) * 180) / Math.PI;
      if (Number.isNaN(c.turn.first_t)) c.turn.first_t = t_s;
      else c.turn.travel += wrapDeg(angle - c.turn.angle);
      c.turn.angle = angle;
      c.turn.t = t_s;
      c.last = r;
      c.seen++;
    }
    if (++candidateFrames < CHOOSE_AFTER) return false;
    const usable = candidates.filter((c): c is Candidate & { last: SpotReading } => c.last !== null && c.seen >= CHOOSE_AFTER / 2);
    const chosen = pickTurningTogether(usable, count);
    candidates = null;
    if (!chosen) return false; // start again at a later frame
    adopt(chosen.map((c) => ({ follower: c.follower, x_px: c.last.x_px, y_px: c.last.y_px, area_px: c.last.area_px ?? 4 })));
    justChosen = true;
    return true;
  };

  const start = (signal: Uint8Array, width: number, t_s: number): boolean => {
    if (candidates && options.centre) return choose(signal, width, t_s, options.centre, null);
    const found = findSpots(signal, width, region).spots;
    if (found.length < count) return false;
    if (found.length > count && options.centre) return choose(signal, width, t_s, options.centre, found);
    // a spot whose equal-area disc would cross the region's edge (a dark corner, the rim) is taken only if nothing else is left
    const inside = (p: { x_px: number; y_px: number; area_px: number }): boolean =>
      Math.min(p.x_px - region.x0, region.x1 - 1 - p.x_px, p.y_px - region.y0, region.y1 - 1 - p.y_px) > Math.sqrt(p.area_px / Math.PI);
    const spots = [...found.filter(inside), ...found.filter((p) => !inside(p))].slice(0, count);
    adopt(spots.map((s) => ({ follower: createSpotFollower({ region, start: { x_px: s.x_px, y_px: s.y_px }, centre: options.centre }), x_px: s.x_px, y_px: s.y_px, area_px: s.area_px })));
    return true;
  };

  return {
    /** Measures every marker in this frame's signal image (width px per row), at frame time t_s; one reading per marker. */
    update(signal: Uint8Array, width: number, t_s: number): SpotReading[] {
      if ((followers.length === 0 && !start(signal, width, t_s)) || justChosen) {
        justChosen = false;
        return Array.from({ length: count }, () => ({ x_px: Number.NaN, y_px: Number.NaN, quality: 0, flag: 'lost:no-blob' }));
      }
      scratch = scratch && scratch.length === signal.length ? scratch : new Uint8Array(signal.length);
      const fill = regionMedian(signal, width);
      const out: SpotReading[] = [];
      for (let j = 0; j < count; j++) {
        scratch.set(signal);
        for (let k = 0; k < count; k++) {
          if (k === j) continue;
          const found = k < j && out[k].flag === '';
          const m = last[k];
          // a marker lost for long could be anywhere: blank it only while its place is still known
          if (!found && m.age > MAX_BLANK_AGE) continue;
          // where marker k is now: measured this frame, or carried on from its last step
          const ahead = found ? 0 : m.age + 1;
          const cx = found ? out[k].x_px : m.x + m.dx * ahead;
          const cy = found ? out[k].y_px : m.y + m.dy * ahead;
          // a straight step misses a circular path by a fraction of the step; half a step per frame of slack covers it and a change of rate
          const slack = found ? 0 : 0.5 * Math.hypot(m.dx, m.dy) * ahead;
          blank(scratch, width, cx, cy, 2 * m.r + 3 + slack, fill);
        }
        let r = followers[j].update(scratch, width, t_s);
        if (r.flag === '') {
          for (let k = 0; k < j; k++) {
            if (out[k].flag === '' && Math.hypot(out[k].x_px - r.x_px, out[k].y_px - r.y_px) < last[j].r + last[k].r) {
              r = { x_px: Number.NaN, y_px: Number.NaN, quality: 0, flag: 'lost:gate' };
              break;
            }
          }
        }
        const m = last[j];
        if (r.flag === '') {
          const steps = m.age + 1;
          m.dx = (r.x_px - m.x) / steps;
          m.dy = (r.y_px - m.y) / steps;
          m.x = r.x_px;
          m.y = r.y_px;
          m.age = 0;
        } else {
          m.age++;
        }
        out.push(r);
      }
      return out;
    },
  };
}

export type MarkerFollowers = ReturnType<typeof createMarkerFollowers>;
