import { arcCoverage } from './arcCoverage.js';
import { findSpots, type Window } from './findSpots.js';
import { fitCircle } from './fitCircle.js';
import { MarkerPathStore } from './MarkerPathStore.js';
import { offCircle } from './pathCheck.js';
import { upperMedian } from './robustSpread.js';
import { createSpotFollower, type SpotFollower } from './spotFollower.js';

/** Largest number of candidate tracks started at the first frame with spots. */
const MOST_CANDIDATES = 6;
/** A path of smaller median radius than this, or moving less than this along its circle (px), is a still spot jittering in place, not a marker going round. */
const MIN_PATH_RADIUS_PX = 3;
/** A detection lies on a path when its distance from the centre is within this share of the median distance (allows views tilted up to about 40°). */
const RADIUS_BAND = 0.25;

/** Full-frame positions of a reading: as measured and with camera motion removed, px. */
export type PlaceReading = (x_px: number, y_px: number) => { x_px: number; y_px: number; sx_px: number; sy_px: number };

/**
 * Follows every spot of the first frame that has any (at most MOST_CANDIDATES: firstCandidates), each with its own spot
 * follower started on it, because at that frame there is no motion yet to tell the marker from a passing
 * particle or reflection. The candidates' tracks are the markers of a MarkerPathStore (frames before the
 * first spot are `lost:no-blob`). After the pass, `pickMarkerTrack` keeps the candidate whose detections move
 * on a circle about the centre. Positions are in the signal image's pixels on input; `place` turns them into full-frame ones.
 */
export function createMarkerHypotheses(options: { region: Window; centre?: { x_px: number; y_px: number } }) {
  const followers: SpotFollower[] = [];
  let paths: MarkerPathStore | null = null;
  let frames = 0;
  let unfollowed = 0;
  return {
    /** The candidates' tracks, or null while no frame has shown a spot. */
    get paths(): MarkerPathStore | null {
      return paths;
    },
    /** Spots of the first frame with spots that could have been the marker but were not followed (beyond MOST_CANDIDATES). */
    get unfollowed(): number {
      return unfollowed;
    },
    /** Feeds one frame's signal image (width px per row) at t_s to every candidate. */
    update(signal: Uint8Array, width: number, t_s: number, place: PlaceReading): void {
      if (!paths) {
        const pool = candidateOrder(findSpots(signal, width, options.region).spots, options.centre ?? null);
        const spots = pool.slice(0, MOST_CANDIDATES);
        if (spots.length > 0) {
          unfollowed = pool.length - spots.length;
          for (const s of spots) followers.push(createSpotFollower({ region: options.region, start: { x_px: s.x_px, y_px: s.y_px }, centre: options.centre }));
          paths = new MarkerPathStore(followers.length);
          for (let i = 0; i < frames; i++) paths.pushLost('lost:no-blob');
        }
      }
      frames++;
      if (!paths) return;
      const readings = followers.map((f) => f.update(signal, width, t_s));
      const placed = readings.map((r) => (Number.isFinite(r.x_px) ? place(r.x_px, r.y_px) : { x_px: NaN, y_px: NaN, sx_px: NaN, sy_px: NaN }));
      paths.push(readings, placed, placed.map((p) => ({ x_px: p.sx_px, y_px: p.sy_px })));
    },
    /** Records a frame no candidate could see (e.g. the camera anchor was lost), with this flag. */
    skip(flag: string): void {
      frames++;
      paths?.pushLost(flag);
    },
  };
}

/**
 * The first frame's spots to follow, at most MOST_CANDIDATES: about a given centre the nearest ones that lie
 * at least MIN_PATH_RADIUS_PX from it (the marker sits on the hub; a still pattern in a corner of the frame,
 * often bigger than a marker, would otherwise crowd it out), else the biggest.
 */
export function firstCandidates<S extends { x_px: number; y_px: number }>(spots: S[], centre: { x_px: number; y_px: number } | null): S[] {
  return candidateOrder(spots, centre).slice(0, MOST_CANDIDATES);
}

/** Every first-frame spot that could be the marker, best first (see firstCandidates). */
function candidateOrder<S extends { x_px: number; y_px: number }>(spots: S[], centre: { x_px: number; y_px: number } | null): S[] {
  if (!centre) return spots;
  const distance = (s: S) => Math.hypot(s.x_px - centre.x_px, s.y_px - centre.y_px);
  return spots.filter((s) => distance(s) >= MIN_PATH_RADIUS_PX).sort((a, b) => distance(a) - distance(b));
}

/** The detections of a track: its positions with the lost frames (NaN) left out, px. */
function detections(x_px: ArrayLike<number>, y_px: ArrayLike<number>): { xs: number[]; ys: number[] } {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < x_px.length; i++) {
    if (Number.isFinite(x_px[i]) && Number.isFinite(y_px[i])) {
      xs.push(x_px[i]);
      ys.push(y_px[i]);
    }
  }
  return { xs, ys };
}

/**
 * How well a set of detections (full-frame px, NaN = none) looks like a marker going round a centre.
 * About a given centre: the number of detections within the off-path band of their median distance from it
 * (offCircle: the marker's own scatter, at most RADIUS_BAND); a spot that barely moves counts too, since the
 * marker of a rotor at rest or turning a degree or two over the run looks just like that, while a particle
 * drifting past changes its distance from the centre.
 * Without a centre: the least-squares circle through the detections, which must lie within their bounding
 * box (a path that sweeps half a turn or more surrounds its centre), and the number of detections within
 * RADIUS_BAND of their median distance from it; a track scores 0 when it keeps no distance of at least
 * MIN_PATH_RADIUS_PX or moves less than that along its circle (a still spot: a corner, a reflection, whose
 * "circle" means nothing). A particle drifting in a straight line scores low: the circle through a straight
 * path has its centre far outside the path.
 */
export function circularPathScore(x_px: ArrayLike<number>, y_px: ArrayLike<number>, centre: { x_px: number; y_px: number } | null): number {
  const { xs, ys } = detections(x_px, y_px);
  if (xs.length < 5) return 0;
  if (centre) {
    const { off, median_radius_px } = offCircle(xs, ys, { cx_px: centre.x_px, cy_px: centre.y_px, axis_ratio: 1, major_axis_deg: 0 });
    if (!(median_radius_px >= MIN_PATH_RADIUS_PX)) return 0;
    return off.reduce((n, v) => n + (v ? 0 : 1), 0);
  }
  const c = fitCircle(xs, ys);
  const inside = c.cx_px >= Math.min(...xs) && c.cx_px <= Math.max(...xs) && c.cy_px >= Math.min(...ys) && c.cy_px <= Math.max(...ys);
  if (!inside) return 0;
  const r = xs.map((x, i) => Math.hypot(x - c.cx_px, ys[i] - c.cy_px));
  const rMedian = upperMedian(r);
  if (!(rMedian >= MIN_PATH_RADIUS_PX)) return 0;
  const band = Math.max(2, RADIUS_BAND * rMedian);
  const ix: number[] = [];
  const iy: number[] = [];
  for (let i = 0; i < r.length; i++) {
    if (Math.abs(r[i] - rMedian) <= band) {
      ix.push(xs[i]);
      iy.push(ys[i]);
    }
  }
  const sweep_px = ((arcCoverage(ix, iy, c.cx_px, c.cy_px) * Math.PI) / 180) * rMedian;
  return sweep_px >= MIN_PATH_RADIUS_PX ? ix.length : 0;
}

/** About a given centre, candidates scoring at least this share of the best are told apart by how they move (pickMarkerTrack). */
const NEAR_BEST_SHARE = 0.9;

/** How far a track's detections went round the centre, px along their median circle (the arc they cover, not the turns). */
export function sweptArc_px(x_px: ArrayLike<number>, y_px: ArrayLike<number>, centre: { x_px: number; y_px: number }): number {
  const { xs, ys } = detections(x_px, y_px);
  if (xs.length < 2) return 0;
  const radius = upperMedian(xs.map((x, i) => Math.hypot(x - centre.x_px, ys[i] - centre.y_px)));
  return ((arcCoverage(xs, ys, centre.x_px, centre.y_px) * Math.PI) / 180) * radius;
}

/**
 * Index of the candidate track that best looks like a marker on a circle (circularPathScore of its steadied
 * positions); 0 when there is one. About a given centre a still pattern of the scene keeps its distance as well
 * as the marker does, so candidates within NEAR_BEST_SHARE of the best score are told apart: the one that went
 * furthest round the centre, when any went MIN_PATH_RADIUS_PX or more; else (a hub at rest) the one nearest the centre.
 */
export function pickMarkerTrack(paths: MarkerPathStore, centre: { x_px: number; y_px: number } | null): number {
  return pickMarkerTrackWithNote(paths, centre).index;
}

/**
 * pickMarkerTrack, and a sentence when the choice was made only by nearness to the centre among several spots
 * that all kept still (the rotor at rest, or a still part of the rig nearer the axis than the marker: a person
 * should check preview.png before reading "it does not turn" from the result).
 */
export function pickMarkerTrackWithNote(paths: MarkerPathStore, centre: { x_px: number; y_px: number } | null): { index: number; note: string | null } {
  const sx = (k: number) => paths.sx_px[k].subarray(0, paths.n);
  const sy = (k: number) => paths.sy_px[k].subarray(0, paths.n);
  const scores = Array.from({ length: paths.count }, (_, k) => circularPathScore(sx(k), sy(k), centre));
  const bestScore = Math.max(...scores);
  const first = scores.indexOf(bestScore);
  if (!centre || !(bestScore > 0)) return { index: first, note: null };
  const near = scores.flatMap((s, k) => (s >= NEAR_BEST_SHARE * bestScore ? [k] : []));
  if (near.length === 1) return { index: first, note: null };
  const swept = near.map((k) => sweptArc_px(sx(k), sy(k), centre));
  const most = Math.max(...swept);
  if (most >= MIN_PATH_RADIUS_PX) return { index: near[swept.indexOf(most)]!, note: null };
  const distance = near.map((k) => {
    const { xs, ys } = detections(sx(k), sy(k));
    return upperMedian(xs.map((x, i) => Math.hypot(x - centre.x_px, ys[i]! - centre.y_px)));
  });
  return {
    index: near[distance.indexOf(Math.min(...distance))]!,
    note: `${near.length} spots kept still at a steady distance from --center, and the one nearest it (${Math.min(...distance).toFixed(0)} px) was taken for the marker; if the rotor may have turned, check in preview.png that this is the marker before reading its rate`,
  };
}
