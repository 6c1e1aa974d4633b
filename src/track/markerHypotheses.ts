import { arcCoverage } from './arcCoverage.js';
import { findSpots, type Window } from './findSpots.js';
import { fitCircle } from './fitCircle.js';
import { createSpotFollower, type SpotFollower } from './spotFollower.js';

/** Largest number of candidate tracks started at the first frame with spots. */
const MOST_CANDIDATES = 6;
/** A path of smaller median radius than this, or moving less than this along its circle (px), is a still spot jittering in place, not a marker going round. */
const MIN_PATH_RADIUS_PX = 3;
/** A detection lies on a path when its distance from the centre is within this share of the median distance (allows views tilted up to about 40°). */
const RADIUS_BAND = 0.25;

/** One candidate marker track: per frame, measured and camera-steadied positions (full-frame px, NaN when lost), quality and flag. */
export interface CandidateTrack {
  x_px: number[];
  y_px: number[];
  sx_px: number[];
  sy_px: number[];
  quality: number[];
  flag: string[];
}

/** Full-frame positions of a reading: as measured and with camera motion removed, px. */
export type PlaceReading = (x_px: number, y_px: number) => { x_px: number; y_px: number; sx_px: number; sy_px: number };

/**
 * Follows every spot of the first frame that has any (the MOST_CANDIDATES biggest), each with its own spot
 * follower started on it, because at that frame there is no motion yet to tell the marker from a passing
 * particle or reflection. After the pass, `pickMarkerTrack` keeps the candidate whose detections move on a
 * circle about the centre. Positions are in the signal image's pixels on input; `place` turns them into full-frame ones.
 */
export function createMarkerHypotheses(options: { region: Window }) {
  const followers: SpotFollower[] = [];
  const tracks: CandidateTrack[] = [];
  let frames = 0;
  return {
    tracks,
    /** Feeds one frame's signal image (width px per row) at t_s to every candidate. */
    update(signal: Uint8Array, width: number, t_s: number, place: PlaceReading): void {
      if (followers.length === 0) {
        const spots = findSpots(signal, width, options.region).spots.slice(0, MOST_CANDIDATES);
        for (const s of spots) {
          followers.push(createSpotFollower({ region: options.region, start: { x_px: s.x_px, y_px: s.y_px } }));
          tracks.push({
            x_px: Array(frames).fill(NaN), y_px: Array(frames).fill(NaN), sx_px: Array(frames).fill(NaN), sy_px: Array(frames).fill(NaN),
            quality: Array(frames).fill(0), flag: Array(frames).fill('lost:no-blob'),
          });
        }
      }
      frames++;
      if (followers.length === 0) return;
      for (let k = 0; k < followers.length; k++) {
        const r = followers[k].update(signal, width, t_s);
        const p = Number.isFinite(r.x_px) ? place(r.x_px, r.y_px) : { x_px: NaN, y_px: NaN, sx_px: NaN, sy_px: NaN };
        const c = tracks[k];
        c.x_px.push(p.x_px);
        c.y_px.push(p.y_px);
        c.sx_px.push(p.sx_px);
        c.sy_px.push(p.sy_px);
        c.quality.push(r.quality);
        c.flag.push(r.flag);
      }
    },
    /** Records a frame no candidate could see (e.g. the camera anchor was lost), with this flag. */
    skip(flag: string): void {
      frames++;
      for (const c of tracks) {
        c.x_px.push(NaN);
        c.y_px.push(NaN);
        c.sx_px.push(NaN);
        c.sy_px.push(NaN);
        c.quality.push(0);
        c.flag.push(flag);
      }
    },
    /** Frames fed so far. */
    get frames(): number {
      return frames;
    },
  };
}

/**
 * How well a set of detections (full-frame px, NaN = none) looks like a marker going round a centre: the number of
 * detections whose distance from the centre is within RADIUS_BAND of the median distance. The centre is the given
 * one, else the least-squares circle through the detections, which must then lie within their bounding box (a
 * path that sweeps half a turn or more surrounds its centre). A track scores 0 when it keeps no distance of at
 * least MIN_PATH_RADIUS_PX or moves less than that along its circle (a still spot: a corner, a reflection).
 * A particle drifting in a straight line scores low: its distance from a given centre changes, and the circle
 * through a straight path has its centre far outside the path.
 */
export function circularPathScore(x_px: ArrayLike<number>, y_px: ArrayLike<number>, centre: { x_px: number; y_px: number } | null): number {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let i = 0; i < x_px.length; i++) {
    if (Number.isFinite(x_px[i]) && Number.isFinite(y_px[i])) {
      xs.push(x_px[i]);
      ys.push(y_px[i]);
    }
  }
  if (xs.length < 5) return 0;
  let cx: number;
  let cy: number;
  if (centre) {
    cx = centre.x_px;
    cy = centre.y_px;
  } else {
    const c = fitCircle(xs, ys);
    const inside = c.cx_px >= Math.min(...xs) && c.cx_px <= Math.max(...xs) && c.cy_px >= Math.min(...ys) && c.cy_px <= Math.max(...ys);
    if (!inside) return 0;
    cx = c.cx_px;
    cy = c.cy_px;
  }
  const r = xs.map((x, i) => Math.hypot(x - cx, ys[i] - cy));
  const rMedian = [...r].sort((a, b) => a - b)[r.length >> 1];
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
  const sweep_px = ((arcCoverage(ix, iy, cx, cy) * Math.PI) / 180) * rMedian;
  return sweep_px >= MIN_PATH_RADIUS_PX ? ix.length : 0;
}

/** Index of the candidate track that best looks like a marker on a circle (circularPathScore of its steadied positions); 0 when there is one. */
export function pickMarkerTrack(tracks: CandidateTrack[], centre: { x_px: number; y_px: number } | null): number {
  let best = 0;
  let bestScore = -1;
  for (let k = 0; k < tracks.length; k++) {
    const s = circularPathScore(tracks[k].sx_px, tracks[k].sy_px, centre);
    if (s > bestScore) {
      best = k;
      bestScore = s;
    }
  }
  return best;
}
