import { InputError } from '../errors.js';
import { arcCoverage } from './arcCoverage.js';
import { combineMarkerAngles } from './combineMarkerAngles.js';
import { fitConcentricEllipses, type ConcentricEllipsesFit, type ConcentricEllipsesOptions, type MarkerPath } from './fitConcentricEllipses.js';
import { EllipseFitFailure } from './fitEllipse.js';
import type { MarkerPathStore } from './MarkerPathStore.js';
import { rotorPlaneAngle, wrapDeg, type ViewGeometry } from './rotorPlaneAngle.js';
import type { TrackSummary } from './TrackSummary.js';
import { viewFromPathFit, viewWithoutPathFit } from './viewFromPathFit.js';

/** Free arc (deg) the markers must sweep together before the centre and view are fitted from their paths. */
const MIN_ARC_FREE_DEG = 270;
/** Arc (deg) the markers must sweep together to fit the view about a given centre. */
const MIN_ARC_CENTRED_DEG = 150;

export interface MultiMarkerGeometryInput {
  store: MarkerPathStore;
  t_s: Float64Array;
  /** Per frame: the decoded frame's number (angle.csv's `frame`). */
  frame_number: ArrayLike<number>;
  /** Per-frame columns that are updated in place: flag, quality, and the first marker's measured x_px, y_px (NaN where it is not kept). */
  frame: { flag: string[]; quality: Float64Array; x_px: Float64Array; y_px: Float64Array };
  centre: { x_px: number; y_px: number } | null;
  tilt_deg?: number;
  tilt_axis_deg?: number;
  /** For messages: the region as x,y,w,h and the marker kind. */
  roi_text: string;
  marker_text: string;
  warnings: string[];
}

export interface MultiMarkerGeometry {
  view: ViewGeometry;
  view_summary: NonNullable<TrackSummary['view']>;
  centre_summary: TrackSummary['centre'];
  /** Per frame: the hub angle in the rotor plane, deg, wrapped; NaN where no marker was kept. */
  wrapped_deg: Float64Array;
  path_fit: { rms_px: number; rejected: number } | null;
  markers: NonNullable<TrackSummary['markers']>;
}

/**
 * Centre, view and per-frame angle from several markers on one hub: the markers' paths (camera motion taken
 * off) are fitted together as concentric ellipses (fitConcentricEllipses), which needs 270° of arc from all
 * markers together (150° about a given centre) rather than from each; points off their path become
 * `lost:off-path` for that marker; each marker's position becomes a rotor-plane angle and the markers are
 * combined per frame (combineMarkerAngles). A frame is lost only when no marker is kept in it; its quality is
 * the kept markers' quality summed over the marker count.
 */
export function multiMarkerGeometry(input: MultiMarkerGeometryInput): MultiMarkerGeometry {
  const { store, t_s, frame, centre, warnings } = input;
  const m = store.count;
  const n = t_s.length;
  const good: number[][] = [];
  if (store.flag.every((f) => f.every((v) => v !== ''))) {
    throw new InputError(`no frame showed ${m} ${input.marker_text} marker spots together in --roi ${input.roi_text}; check --markers (the number of spots on the hub), --roi and --marker`);
  }
  for (let k = 0; k < m; k++) {
    const g: number[] = [];
    for (let i = 0; i < n; i++) if (store.flag[k][i] === '') g.push(i);
    if (g.length < 5) {
      throw new InputError(`marker ${k + 1} of ${m} (${input.marker_text}) was found in only ${g.length} of ${n} frames in --roi ${input.roi_text}; check --markers, --roi and --marker`);
    }
    good.push(g);
  }
  const paths: MarkerPath[] = good.map((g, k) => ({ x_px: Float64Array.from(g, (i) => store.sx_px[k][i]), y_px: Float64Array.from(g, (i) => store.sy_px[k][i]) }));
  const allX = Float64Array.from(paths.flatMap((p) => Array.from(p.x_px)));
  const allY = Float64Array.from(paths.flatMap((p) => Array.from(p.y_px)));

  let fit: ConcentricEllipsesFit | null = null;
  let cx: number;
  let cy: number;
  if (centre) {
    cx = centre.x_px;
    cy = centre.y_px;
  } else {
    const stride = Math.max(1, Math.ceil(allX.length / 4000));
    const thin = paths.map((p) => ({ x_px: p.x_px.filter((_, i) => i % stride === 0), y_px: p.y_px.filter((_, i) => i % stride === 0) }));
    const start = fitPaths(thin, { resamples: 0 }, m).ellipses[0];
    const arc = arcCoverage(allX, allY, start.cx_px, start.cy_px);
    if (!(arc >= MIN_ARC_FREE_DEG)) {
      throw new InputError(
        `the ${m} markers together swept only ${arc.toFixed(0)}° of the circle, too little to fit the centre and view; give --center x,y (and the tilt in degrees with --tilt if the camera is not square to the axis)`,
      );
    }
    cx = start.cx_px;
    cy = start.cy_px;
  }
  const arcAbout = arcCoverage(allX, allY, cx, cy);
  let view: ViewGeometry;
  let viewSummary: NonNullable<TrackSummary['view']>;
  let centreSummary: TrackSummary['centre'];
  if (!centre || arcAbout >= MIN_ARC_CENTRED_DEG) {
    fit = fitPaths(paths, centre ? { centre } : {}, m);
    for (let k = 0; k < m; k++) {
      good[k].forEach((i, j) => {
        if (fit!.inlier[k][j]) return;
        store.flag[k][i] = 'lost:off-path';
        store.quality[k][i] = 0;
      });
    }
    ({ view, view_summary: viewSummary, centre_summary: centreSummary } = viewFromPathFit(
      { ellipse: fit.ellipses[0], axis_ratio: fit.axis_ratio, se: fit.se, ci95: fit.ci95 },
      { centre, tilt_deg: input.tilt_deg, tilt_axis_deg: input.tilt_axis_deg },
    ));
  } else {
    ({ view, view_summary: viewSummary, centre_summary: centreSummary } = viewWithoutPathFit(
      cx, cy, { centre, tilt_deg: input.tilt_deg, tilt_axis_deg: input.tilt_axis_deg }, arcAbout, 'The markers together', warnings,
    ));
  }

  // per-marker rotor-plane angles, then one angle per frame
  const plain: ViewGeometry = { cx_px: view.cx_px, cy_px: view.cy_px, axis_ratio: 1, major_axis_deg: 0 };
  let maxCorrection = 0;
  const perMarker = Array.from({ length: m }, (_, k) => {
    const a = new Float64Array(n).fill(Number.NaN);
    for (let i = 0; i < n; i++) {
      if (store.flag[k][i] !== '') continue;
      a[i] = rotorPlaneAngle(store.sx_px[k][i], store.sy_px[k][i], view);
      maxCorrection = Math.max(maxCorrection, Math.abs(wrapDeg(a[i] - rotorPlaneAngle(store.sx_px[k][i], store.sy_px[k][i], plain))));
    }
    return a;
  });
  viewSummary.max_correction_deg = maxCorrection;
  const combined = combineMarkerAngles(t_s, perMarker);
  if (combined.first_all_index < 0) {
    throw new InputError(`the ${m} markers were never all kept in the same frame (their paths disagree), so their phase offsets are unknown; check --markers and --roi, and that the markers lie farther apart than the hub turns between frames`);
  }
  let disagreeing = 0;
  let several = 0;
  for (let i = 0; i < n; i++) {
    const f = store.frameOf(i);
    frame.flag[i] = f.flag;
    frame.quality[i] = f.quality;
    if (combined.found[i] >= 2) several++;
    if (combined.disagree[i] === 1) {
      // the markers found do not turn together here: one of them has followed a particle or reflection
      frame.flag[i] = 'lost:markers-disagree';
      frame.quality[i] = 0;
      disagreeing++;
    }
    if (store.flag[0][i] !== '' || combined.disagree[i] === 1) {
      frame.x_px[i] = Number.NaN;
      frame.y_px[i] = Number.NaN;
    }
  }
  if (disagreeing > 0 && disagreeing >= 0.05 * several) {
    warnings.push(`In ${disagreeing} of the ${several} frames with several markers, the markers disagreed about the hub's angle by more than ${combined.disagree_band_deg.toFixed(1)}° after their phase offsets (flagged lost:markers-disagree): a follower probably took a particle or reflection; frames with one marker cannot be checked this way, so check preview.png.`);
  }
  const foundFrames = Array.from({ length: m }, (_, k) => store.flag[k].reduce((c, f, i) => c + (i < n && f === '' ? 1 : 0), 0));
  return {
    view,
    view_summary: viewSummary,
    centre_summary: centreSummary,
    wrapped_deg: combined.wrapped_deg,
    path_fit: fit ? { rms_px: fit.rms_px, rejected: fit.inlier.reduce((s, mask) => s + mask.reduce((z, v) => z + (v ? 0 : 1), 0), 0) } : null,
    markers: {
      count: m,
      found_frames: foundFrames,
      all_found_frames: combined.all_found_frames,
      first_all_found_frame: input.frame_number[combined.first_all_index],
      phase_offset_deg: combined.phase_offset_deg,
      semi_major_px: fit ? fit.ellipses.map((e) => e.semi_major_px) : paths.map((p) => meanDistance(p, cx, cy)),
    },
  };
}

/** fitConcentricEllipses, with its failure turned into one sentence for people. */
function fitPaths(paths: MarkerPath[], options: ConcentricEllipsesOptions, m: number): ConcentricEllipsesFit {
  try {
    return fitConcentricEllipses(paths, options);
  } catch (err) {
    if (!(err instanceof EllipseFitFailure)) throw err;
    throw new InputError(`the ${m} markers' paths do not fit one hub's concentric circles (${err.message}); check --markers, --roi and preview.png, and that the markers lie farther apart than the hub turns between frames`);
  }
}

/** Mean distance of a path's points from a centre, px. */
function meanDistance(p: MarkerPath, cx: number, cy: number): number {
  let s = 0;
  for (let i = 0; i < p.x_px.length; i++) s += Math.hypot(p.x_px[i] - cx, p.y_px[i] - cy);
  return s / Math.max(1, p.x_px.length);
}
