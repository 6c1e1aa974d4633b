import { findSpots, type Window } from './findSpots.js';
import { robustSpread, upperMedian } from './robustSpread.js';
import { AREA_HISTORY, steadySizeBand } from './steadySizeBand.js';

/** One frame's marker measurement, in the signal image's pixel coordinates; NaN position when lost. */
export interface SpotReading {
  x_px: number;
  y_px: number;
  /** 0–1: contrast over noise and agreement of the spot's size with recent frames. */
  quality: number;
  /** '' when found, else 'lost:no-blob' | 'lost:gate' | 'lost:shape' | 'lost:repeated-frame'. */
  flag: string;
  /** Area of the accepted spot, px (absent when lost). */
  area_px?: number;
  /** True when the accepted spot was held to the steady-size band (false for the first frames after a start, before the marker's size was known). */
  size_held?: boolean;
}

export interface SpotFollowerOptions {
  /** Where the marker may be, in signal-image pixels. */
  region: Window;
  /** Smallest gate radius around the predicted position, px (default 1.5). */
  min_gate_px?: number;
  /** Gate = this many times the RMS of recent prediction misses, if larger than min_gate_px (default 5). */
  gate_rms_factor?: number;
  /** A spot whose area differs from the recent median by more than this factor is refused (default 1.6). */
  area_factor?: number;
  /** After this many frames lost in a row, forget the motion and the spot size and search the whole region again (default 15). */
  reacquire_after?: number;
  /** A marker that stood still or crept (SLOW_PX_PER_FRAME) and is then lost this many frames in a row has probably started to turn: search the whole region again, keeping its size (default 2). */
  restart_after?: number;
  /** Where to start, signal-image px: the first search takes the spot nearest this point (default: the biggest spot). */
  start?: { x_px: number; y_px: number };
  /** The rotation centre when it is known beforehand (--center) and the camera does not move, signal-image px: after a loss, a spot off the marker's recent distance from it is refused. */
  centre?: { x_px: number; y_px: number };
}

/** Recent positions whose first and last lie less than this far apart per frame between them (px): the marker stands still or creeps (the rotor is at rest, just starting, or nearly at rest). */
const SLOW_PX_PER_FRAME = 0.5;

/** A step between frame times this many times the usual one is a gap (frames dropped by the camera). */
const GAP_STEPS = 3;

/** The usual step between the recent accepted frames' times, s (Infinity with fewer than three). */
function typicalStep(hist: readonly { t: number }[]): number {
  if (hist.length < 3) return Infinity;
  const steps: number[] = [];
  for (let i = Math.max(1, hist.length - 8); i < hist.length; i++) steps.push(hist[i]!.t - hist[i - 1]!.t);
  steps.sort((a, b) => a - b);
  return steps[steps.length >> 1]!;
}

/**
 * Follows one marker spot from frame to frame. The next position is predicted from recent good positions (circle through the first, middle and last of the last seven, constant angular rate at each frame's
 * own time; or straight on from the last step); the spot is searched near the prediction and refused when it lies outside the gate
 * (`lost:gate`: a passing particle or reflection) or its size jumps (`lost:shape`: something merged with or
 * covered the marker; beyond a fixed factor, or beyond the scatter of a size that has kept steady). A marker at
 * rest that is lost for a couple of frames (not under something bigger) is looked for over the whole region
 * again: the rotor has probably started. A search without a prediction takes the spot nearest where the marker
 * was last seen. Positions are never invented: a refused frame stays lost.
 */
export function createSpotFollower(options: SpotFollowerOptions) {
  const region = options.region;
  const minGate = options.min_gate_px ?? 1.5;
  const gateFactor = options.gate_rms_factor ?? 5;
  const areaFactor = options.area_factor ?? 1.6;
  const reacquireAfter = options.reacquire_after ?? 15;
  const restartAfter = options.restart_after ?? 2;
  const hist: { t: number; x: number; y: number }[] = [];
  const misses: number[] = [];
  const areas: number[] = [];
  /** Recent distances of the accepted spot from the known centre, px (empty without a centre). */
  const radii: number[] = [];
  const centre = options.centre ?? null;
  let lostRun = 0;
  /** Frames of the current lost run in which something of another size sat where the marker was looked for (a particle merged with it). */
  let shapeLosses = 0;
  let start = options.start ?? null;
  /** Where the marker was last accepted, signal-image px: a whole-region search without a prediction takes the spot nearest it. */
  let lastSeen: { x: number; y: number } | null = null;
  /** Time of the previous frame, s. */
  let prevT: number | null = null;

  /** Whether a spot lies at the marker's steady distance from the known centre (true without a centre or before that distance is known). */
  const onMarkerCircle = (x: number, y: number): boolean =>
    !centre || radii.length < AREA_HISTORY || Math.abs(Math.hypot(x - centre.x_px, y - centre.y_px) - upperMedian(radii)) <= steadyRadiusBand(radii);

  /** Predictions for time t: along the circle through the first, middle and last kept points (constant
   * angular rate over the last step), and straight on from the last step; the marker may match either. */
  const predict = (t: number): { x: number; y: number }[] => {
    const m = hist.length;
    if (m === 0) return [];
    const c = hist[m - 1];
    if (m === 1) return [{ x: c.x, y: c.y }];
    const b = hist[m - 2];
    const span = c.t - b.t;
    const ahead = span > 0 ? (t - c.t) / span : 0;
    const out = [{ x: c.x + (c.x - b.x) * ahead, y: c.y + (c.y - b.y) * ahead }];
    if (m >= 3) {
      const circ = circumcentre(hist[0], hist[m >> 1], c);
      if (circ) {
        const r = Math.hypot(c.x - circ.x, c.y - circ.y);
        const step = wrapRad(Math.atan2(c.y - circ.y, c.x - circ.x) - Math.atan2(b.y - circ.y, b.x - circ.x));
        const th = Math.atan2(c.y - circ.y, c.x - circ.x) + step * ahead;
        out.unshift({ x: circ.x + r * Math.cos(th), y: circ.y + r * Math.sin(th) });
      }
    }
    return out;
  };


  return {
    /** Measures the marker in this frame's signal image (width px per row), at frame time t_s. */
    update(signal: Uint8Array, width: number, t_s: number): SpotReading {
      if (lostRun >= reacquireAfter) {
        // start afresh: the motion and the size learned before may belong to something else (the search then
        // takes the spot nearest the last place the marker was seen, not the biggest: a particle is often bigger).
        // About a known centre, what was followed kept the marker's distance from it, so its size is the marker's: held
        // for one more wait, a blob the marker forms with a particle travelling along its circle is still refused; a size
        // that really changed while the marker was hidden is learned after a second wait, and so is the distance.
        hist.length = 0;
        misses.length = 0;
        if (!centre || lostRun >= 2 * reacquireAfter) {
          areas.length = 0;
          radii.length = 0;
        }
      } else if (lostRun >= restartAfter && shapeLosses === 0 && hist.length >= 3 && movesSlowly(hist)) {
        // a rotor starting from rest leaves the tight gate of a still marker within a frame or two, faster than the
        // gate widens: look for it over the whole region again (nearest to where it stood), still of the size it had
        hist.length = 0;
        misses.length = 0;
      }
      // a gap in the frame times (frames the camera dropped): over it the gate's extrapolation is too loose or too
      // tight, so the marker is looked for over the whole region, nearest where it should be now
      const gapped = prevT !== null && t_s - prevT > GAP_STEPS * typicalStep(hist);
      prevT = t_s;
      const preds = predict(t_s);
      const pred = preds.length ? preds[0] : null;
      const typicalArea = areas.length >= 3 ? upperMedian(areas) : 0;
      const spotRadius = typicalArea > 0 ? Math.sqrt(typicalArea / Math.PI) : 0;
      let gate = Infinity;
      let candidate: { x: number; y: number } | null = pred;
      if (pred && hist.length >= 3 && !gapped) {
        const rms = misses.length ? Math.sqrt(misses.reduce((s, v) => s + v * v, 0) / misses.length) : minGate;
        // a rate error grows with the distance extrapolated: allow 5 % of it, 15 % beyond one frame step
        const c = hist[hist.length - 1];
        const b = hist[hist.length - 2];
        const stepPx = Math.hypot(c.x - b.x, c.y - b.y);
        const ahead = c.t > b.t ? (t_s - c.t) / (c.t - b.t) : 1;
        gate = Math.max(minGate, gateFactor * rms) * (1 + lostRun) + stepPx * (0.05 * ahead + 0.15 * Math.max(0, ahead - 1));
      }
      if (!candidate || hist.length < 3 || gapped) {
        // search the whole region (start, or few frames of history): take the spot nearest the last position, else the biggest
        const all = findSpots(signal, width, region);
        if (all.spots.length === 0) return lost('lost:no-blob');
        // about a known centre, only spots at the marker's distance from it (when any is)
        const onCircle = all.spots.filter((s) => onMarkerCircle(s.x_px, s.y_px));
        const pool = onCircle.length > 0 ? onCircle : all.spots;
        let best = pool[0];
        const near = pred ?? (start ? { x: start.x_px, y: start.y_px } : lastSeen);
        if (near) {
          for (const s of pool) if (Math.hypot(s.x_px - near.x, s.y_px - near.y) < Math.hypot(best.x_px - near.x, best.y_px - near.y)) best = s;
        }
        start = null;
        candidate = { x: best.x_px, y: best.y_px };
        if (typicalArea === 0) {
          areas.push(best.area_px);
        }
      }
      // Refine in a local window (local background) around the candidate
      const r0 = spotRadius > 0 ? spotRadius : Math.sqrt(Math.max(4, areas[areas.length - 1] ?? 20) / Math.PI);
      const half = Math.ceil(3 * r0 + 6 + (Number.isFinite(gate) ? gate : 0));
      const win: Window = {
        x0: Math.max(region.x0, Math.floor(candidate.x) - half),
        y0: Math.max(region.y0, Math.floor(candidate.y) - half),
        x1: Math.min(region.x1, Math.floor(candidate.x) + half + 1),
        y1: Math.min(region.y1, Math.floor(candidate.y) + half + 1),
      };
      const local = findSpots(signal, width, win);
      if (local.spots.length === 0) return lost('lost:no-blob');
      let spot = local.spots[0];
      for (const s of local.spots) {
        if (Math.hypot(s.x_px - candidate.x, s.y_px - candidate.y) < Math.hypot(spot.x_px - candidate.x, spot.y_px - candidate.y)) spot = s;
      }
      const miss = preds.length ? Math.min(...preds.map((p) => Math.hypot(spot.x_px - p.x, spot.y_px - p.y))) : 0;
      if (miss > gate) {
        // the same picture as the last frame while the marker should have moved: a repeated frame, whose time stamp is not its own
        const last = hist[hist.length - 1];
        const still = last && pred && Math.hypot(spot.x_px - last.x, spot.y_px - last.y) < 0.02 && Math.hypot(pred.x - last.x, pred.y - last.y) > 0.5;
        return lost(still ? 'lost:repeated-frame' : 'lost:gate');
      }
      // a few pixels of slack so that small markers (a dozen pixels) may flicker in size
      const ratio = typicalArea > 0 ? (spot.area_px + 6) / (typicalArea + 6) : 1;
      if (areas.length >= 3 && (ratio > areaFactor || ratio < 1 / areaFactor)) return lost('lost:shape');
      // a marker whose size has kept steady (a slow one, same pixels every frame) is held to that: a particle
      // touching it merges into a blob a third bigger, still inside the fixed factor, and would drag the track away
      const held = areas.length >= AREA_HISTORY;
      if (held && Math.abs(spot.area_px - typicalArea) > steadySizeBand(areas)) return lost('lost:shape');
      // about a known centre the marker keeps its distance: after a loss, a particle the widened gate lets in does not
      // (without this the follower stays on the particle and never comes back to the marker). Not while following
      // normally: in an oblique view the distance changes along the ellipse faster than the recent ones show.
      const radius = centre ? Math.hypot(spot.x_px - centre.x_px, spot.y_px - centre.y_px) : Number.NaN;
      if (lostRun > 0 && !onMarkerCircle(spot.x_px, spot.y_px)) return lost('lost:gate');
      // accepted
      if (pred && hist.length >= 3 && lostRun === 0 && !gapped) {
        misses.push(miss);
        if (misses.length > 30) misses.shift();
      }
      // the step across a gap is not a frame step (a fast rotor turns more than half a turn over it, and the next
      // prediction would run backwards): the motion is learned afresh from here
      if (gapped) hist.length = 0;
      hist.push({ t: t_s, x: spot.x_px, y: spot.y_px });
      lastSeen = { x: spot.x_px, y: spot.y_px };
      if (hist.length > 7) hist.shift();
      areas.push(spot.area_px);
      if (areas.length > 15) areas.shift();
      if (centre) {
        radii.push(radius);
        if (radii.length > 15) radii.shift();
      }
      lostRun = 0;
      shapeLosses = 0;
      const snr = spot.contrast / (spot.contrast + 10 * spot.noise);
      const shape = Math.min(ratio, 1 / ratio);
      return { x_px: spot.x_px, y_px: spot.y_px, quality: Math.max(0, Math.min(1, snr * shape)), flag: '', area_px: spot.area_px, size_held: held };
    },
  };

  function lost(flag: string): SpotReading {
    lostRun++;
    if (flag === 'lost:shape') shapeLosses++;
    return { x_px: Number.NaN, y_px: Number.NaN, quality: 0, flag };
  }
}

export type SpotFollower = ReturnType<typeof createSpotFollower>;

/**
 * How far the marker's distance from a known centre may move from its typical (upper median) recent value, px:
 * 5 robust SDs of the recent distances (in an oblique view the distance changes along the ellipse, and a fast
 * marker's recent distances cover that change), at least 3 px (camera shake, compression). Common practice, no source.
 */
function steadyRadiusBand(radii: readonly number[]): number {
  return Math.max(3, 5 * robustSpread(radii).sigma);
}

/** Whether the first and last kept positions lie less than SLOW_PX_PER_FRAME apart per kept step between them. */
function movesSlowly(points: readonly { x: number; y: number }[]): boolean {
  const a = points[0];
  const b = points[points.length - 1];
  return Math.hypot(b.x - a.x, b.y - a.y) < SLOW_PX_PER_FRAME * (points.length - 1);
}

function wrapRad(a: number): number {
  return a - 2 * Math.PI * Math.round(a / (2 * Math.PI));
}

/** Centre of the circle through three points, or null when they are nearly collinear. */
function circumcentre(a: { x: number; y: number }, b: { x: number; y: number }, c: { x: number; y: number }): { x: number; y: number } | null {
  const d = 2 * (a.x * (b.y - c.y) + b.x * (c.y - a.y) + c.x * (a.y - b.y));
  const scale = Math.max(Math.hypot(b.x - a.x, b.y - a.y), Math.hypot(c.x - b.x, c.y - b.y)) ** 2;
  if (!(scale > 0) || Math.abs(d) < 1e-3 * scale) return null; // coincident points (a marker at rest) have no circle
  const a2 = a.x * a.x + a.y * a.y;
  const b2 = b.x * b.x + b.y * b.y;
  const c2 = c.x * c.x + c.y * c.y;
  const x = (a2 * (b.y - c.y) + b2 * (c.y - a.y) + c2 * (a.y - b.y)) / d;
  const y = (a2 * (c.x - b.x) + b2 * (a.x - c.x) + c2 * (b.x - a.x)) / d;
  const r = Math.hypot(a.x - x, a.y - y);
  if (r > 1e4) return null;
  return { x, y };
}
