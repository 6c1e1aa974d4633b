import { InputError } from '../errors.js';
import { SOFTWARE } from '../version.js';
import { hashFile } from '../video/hashFile.js';
import { probeVideoHeader, type VideoHeader } from '../video/probeVideo.js';
import { readFrames } from '../video/readFrames.js';
import { frameTiming } from '../video/frameTiming.js';
import type { AngleSeries } from './AngleSeries.js';
import type { TrackSummary } from './TrackSummary.js';
import { applyCameraMotion, createAnchorTracker, removeCameraMotion, type AnchorTracker } from './anchorTracker.js';
import { createTextureTracker, type TextureTracker } from './textureTracker.js';
import { arcCoverage } from './arcCoverage.js';
import { colourSimilarityTable } from './colourDistanceTable.js';
import { fitCircle, type Circle } from './fitCircle.js';
import { fitPathEllipse, type RobustEllipseFit } from './fitEllipseRobust.js';
import { rotorPlaneAngle, wrapDeg, type ViewGeometry } from './rotorPlaneAngle.js';
import { createMarkerHypotheses, pickMarkerTrackWithNote } from './markerHypotheses.js';
import { offCircle } from './pathCheck.js';
import { createMarkerFollowers } from './followMarkers.js';
import { MarkerPathStore } from './MarkerPathStore.js';
import { earlySizeOutliers } from './earlySizeOutliers.js';
import { doubleCapacity } from './doubleCapacity.js';
import { multiMarkerGeometry } from './multiMarkerGeometry.js';
import { checkInside, checkTrackOptionNames, parseMarker, toRegion, type MarkerMode, type RegionPx, type TrackOptions } from './TrackOptions.js';
import { TrackingError } from './TrackingError.js';
import { givenQuantity, viewFromPathFit, viewWithoutPathFit } from './viewFromPathFit.js';
import { unwrapAngles } from './unwrapAngles.js';
import { markPreview, readPreviewFrame, type PreviewImage } from './drawPreview.js';

export type { TrackOptions, RegionPx } from './TrackOptions.js';

/** What trackVideo returns: the angle series, the summary (track.json) and a preview image (RGB). */
export interface TrackResult {
  series: AngleSeries;
  summary: TrackSummary;
  preview: PreviewImage;
}

/** Free arc (deg) the marker must sweep before the centre and view are fitted from its path. */
const MIN_ARC_FREE_DEG = 270;
/** Fewest frames with the marker found that a track is made from. */
const MIN_FRAMES = 5;
/** Arc (deg) needed to fit the view about a given centre. */
const MIN_ARC_CENTRED_DEG = 150;
/** Share of kept marker detections off the marker's circle above which the track is reported as doubtful. */
const OFF_CIRCLE_WARN_SHARE = 0.1;

/**
 * Tracks a rotating hub in a video and returns its unwrapped angle per decoded frame.
 * One decoding pass reads only the region (and anchor) from ffmpeg; per frame only numbers are kept.
 * Afterwards the centre and the view (ellipse) are fitted from the marker path, the positions are
 * turned into angles in the rotor's own plane and unwrapped.
 * Angle zero: the first good frame's angle is the marker's absolute angle in the rotor plane, measured
 * counterclockwise from the image's +x direction about the centre (texture mode: 0 at the first frame).
 */
export async function trackVideo(path: string, options: TrackOptions = {}): Promise<TrackResult> {
  checkTrackOptionNames(options);
  const mode = parseMarker(options.marker ?? 'bright');
  const header = options.header ?? (await probeVideoHeader(path, { ffprobe: options.ffprobe }));
  const roi = options.roi !== undefined ? toRegion('--roi', options.roi) : { x: 0, y: 0, w: header.width, h: header.height };
  const regionWords = options.roi !== undefined ? `--roi ${roi.x},${roi.y},${roi.w},${roi.h}` : `the whole ${roi.w}×${roi.h} frame (no --roi given)`;
  checkInside('--roi', roi, header.width, header.height);
  const anchor = options.anchor !== undefined ? toRegion('--anchor', options.anchor) : null;
  if (anchor) checkInside('--anchor', anchor, header.width, header.height);
  const centre = resolveCentre(options.centre);
  if (centre && (centre.x_px < roi.x || centre.y_px < roi.y || centre.x_px > roi.x + roi.w - 1 || centre.y_px > roi.y + roi.h - 1)) {
    throw new InputError(`--center ${centre.x_px},${centre.y_px} lies outside --roi ${roi.x},${roi.y},${roi.w},${roi.h}; give the centre of rotation inside the region`);
  }
  if (options.tilt_deg !== undefined && !(options.tilt_deg >= 0 && options.tilt_deg < 85)) {
    throw new InputError(`--tilt ${options.tilt_deg} must be an angle from 0 to 85 degrees`);
  }
  if (mode.kind === 'texture' && !centre) {
    throw new InputError('--marker texture needs --center x,y (the rotation centre in pixels)');
  }
  const markerCount = options.markers ?? 1;
  if (!(Number.isInteger(markerCount) && markerCount >= 1 && markerCount <= 8)) throw new InputError(`--markers ${markerCount} must be a whole number of marker spots from 1 to 8`);
  if (markerCount > 1 && mode.kind === 'texture') throw new InputError(`--markers ${markerCount} needs marker spots (bright, dark or color:#rrggbb); texture mode follows the hub's surface instead`);
  const tolerance = options.colour_tolerance ?? 40;
  const crop = anchor ? union(roi, anchor) : roi;
  const warnings: string[] = [];

  // ---- one decoding pass: per-frame numbers only ----
  const store = new FrameStore();
  const region = { x0: roi.x - crop.x, y0: roi.y - crop.y, x1: roi.x - crop.x + roi.w, y1: roi.y - crop.y + roi.h };
  // a centre given beforehand, in the signal image's pixels: the followers hold each marker to its distance from it after
  // a loss (not with --anchor: the followers see the camera's motion, the centre would move by it)
  const knownCentre = centre && !anchor ? { centre: { x_px: centre.x_px - crop.x, y_px: centre.y_px - crop.y } } : {};
  const follower = mode.kind === 'texture' ? null : createMarkerHypotheses({ region, ...knownCentre });
  const multi = markerCount > 1 ? { followers: createMarkerFollowers({ region, count: markerCount, ...knownCentre }), paths: new MarkerPathStore(markerCount) } : null;
  const colourTable = mode.kind === 'color' ? colourSimilarityTable(mode.rgb, tolerance) : null;
  const anchorTracker: AnchorTracker | null = anchor ? createAnchorTracker({ anchor }) : null;
  let texture: TextureTracker | null = null;
  if (mode.kind === 'texture' && centre) {
    const edge = Math.min(centre.x_px - roi.x, centre.y_px - roi.y, roi.x + roi.w - 1 - centre.x_px, roi.y + roi.h - 1 - centre.y_px);
    const [rIn, rOut] = options.texture_radii_px ?? [Math.min(10, 0.3 * edge), 0.9 * edge];
    if (!(rOut > rIn + 4)) throw new InputError(`--center ${centre.x_px},${centre.y_px} is too close to the edge of --roi for texture tracking; give a region that holds the whole hub`);
    texture = createTextureTracker({ centre, r_inner_px: rIn, r_outer_px: rOut });
  }
  let signalBuf: Uint8Array | null = null;
  let grayBuf: Uint8Array | null = null;
  const duration_s = Math.max(0, Math.min(options.to_s ?? Infinity, header.duration_s) - (options.from_s ?? 0));
  const end_s = header.start_s + header.duration_s;
  if (options.from_s !== undefined && Number.isFinite(end_s) && options.from_s >= end_s) {
    throw new InputError(`--from ${options.from_s} s is at or after the end of ${path} (${end_s.toFixed(2)} s); give a start time within the video`);
  }
  let colourSeen = 0;
  let shiftMax = 0;
  let rotMax = 0;
  let shiftSs = 0;
  let motionCount = 0;

  // The preview frame and the file's hash are read beside the decoding pass (they are cheap, but were
  // time added after it); both stop when tracking fails or the caller aborts.
  const side = new AbortController();
  const sideSignal = options.signal ? AbortSignal.any([options.signal, side.signal]) : side.signal;
  const previewFrame = readPreviewFrame(path, { header, ffmpeg: options.ffmpeg, ffprobe: options.ffprobe, from_s: options.from_s, signal: sideSignal });
  const hashing = hashFile(path, { signal: sideSignal });
  previewFrame.catch(() => undefined); // awaited below; this only keeps a failure from going unhandled when tracking fails first
  hashing.catch(() => undefined);
  try {
    for await (const frame of readFrames(path, {
      ffmpeg: options.ffmpeg,
      ffprobe: options.ffprobe,
      pixels: mode.kind === 'color' ? 'rgb' : 'gray',
      roi: crop,
      from_s: options.from_s,
      to_s: options.to_s,
      signal: options.signal,
      header,
      reuse_buffers: true, // each frame is reduced to numbers before the next is read
    })) {
      const W = frame.width;
      let gray = frame.data;
      if (frame.channels === 3) {
        grayBuf ??= new Uint8Array(W * frame.height);
        const d = frame.data;
        for (let i = 0, j = 0; i < grayBuf.length; i++, j += 3) grayBuf[i] = (77 * d[j] + 150 * d[j + 1] + 29 * d[j + 2]) >> 8;
        gray = grayBuf;
      }
      let motion = { dx_px: 0, dy_px: 0, rotation_deg: 0, quality: 1 };
      if (anchorTracker) {
        motion = anchorTracker.update({ data: gray, width: W, height: frame.height, origin_x_px: crop.x, origin_y_px: crop.y });
        if (Number.isFinite(motion.dx_px)) {
          const s = Math.hypot(motion.dx_px, motion.dy_px);
          shiftMax = Math.max(shiftMax, s);
          rotMax = Math.max(rotMax, Math.abs(motion.rotation_deg));
          shiftSs += s * s;
          motionCount++;
        }
      }
      if (anchorTracker && !Number.isFinite(motion.dx_px)) {
        store.push(frame.index, frame.t_s, NaN, NaN, NaN, NaN, NaN, 0, 'lost:camera');
        multi?.paths.pushLost('lost:camera');
        if (!multi) follower?.skip('lost:camera');
      } else if (texture && centre) {
        let offset: { dx_px: number; dy_px: number } | undefined;
        if (anchorTracker) {
          const moved = applyCameraMotion(centre, motion, anchorTracker.pivot);
          offset = { dx_px: moved.x_px - centre.x_px, dy_px: moved.y_px - centre.y_px };
        }
        const r = texture.update({ data: gray, width: W, height: frame.height, origin_x_px: crop.x, origin_y_px: crop.y }, offset);
        const a = r.angle_deg - (anchorTracker ? motion.rotation_deg : 0);
        store.push(frame.index, frame.t_s, NaN, NaN, NaN, NaN, a, r.quality, Number.isFinite(a) ? '' : 'lost:texture');
      } else if (follower) {
        let signal: Uint8Array;
        if (mode.kind === 'bright') {
          signal = gray;
        } else {
          signalBuf ??= new Uint8Array(W * frame.height);
          signal = signalBuf;
          const d = frame.data;
          for (let y = region.y0; y < region.y1; y++) {
            for (let x = region.x0, i = y * W + region.x0; x < region.x1; x++, i++) {
              if (colourTable) {
                const j = 3 * i;
                const v = colourTable[((d[j] >> 2) << 12) | ((d[j + 1] >> 2) << 6) | (d[j + 2] >> 2)];
                signal[i] = v;
                if (v > 0) colourSeen++;
              } else {
                signal[i] = 255 - d[i];
              }
            }
          }
        }
        if (multi) {
          const readings = multi.followers.update(signal, W, frame.t_s);
          const measured = readings.map((r) => ({ x_px: r.x_px + crop.x, y_px: r.y_px + crop.y }));
          const steadied = anchorTracker ? measured.map((p) => (Number.isFinite(p.x_px) ? removeCameraMotion(p, motion, anchorTracker.pivot) : p)) : measured;
          multi.paths.push(readings, measured, steadied);
          const f = multi.paths.frameOf(multi.paths.n - 1);
          store.push(frame.index, frame.t_s, measured[0].x_px, measured[0].y_px, steadied[0].x_px, steadied[0].y_px, NaN, f.quality, f.flag);
          if (options.onProgress && store.n % 10 === 0) options.onProgress({ frames: store.n, t_s: frame.t_s, duration_s });
          continue;
        }
        // candidate tracks are kept for the whole pass; the marker's is chosen afterwards
        follower.update(signal, W, frame.t_s, (x_px, y_px) => {
          const x = x_px + crop.x;
          const y = y_px + crop.y;
          const p = anchorTracker ? removeCameraMotion({ x_px: x, y_px: y }, motion, anchorTracker.pivot) : { x_px: x, y_px: y };
          return { x_px: x, y_px: y, sx_px: p.x_px, sy_px: p.y_px };
        });
        store.push(frame.index, frame.t_s, NaN, NaN, NaN, NaN, NaN, 0, 'lost:no-blob');
      }
      if (options.onProgress && store.n % 10 === 0) options.onProgress({ frames: store.n, t_s: frame.t_s, duration_s });
    }
    if (store.n === 0) {
      throw new TrackingError(`no frames were decoded from ${path} between ${options.from_s ?? 'the start'} and ${options.to_s ?? 'the end'} s; check --from and --to`, path);
    }
    if (store.n < MIN_FRAMES) {
      const window = options.from_s !== undefined || options.to_s !== undefined ? ' in the window --from/--to' : '';
      throw new InputError(`${path} has only ${store.n} frame${store.n === 1 ? '' : 's'}${window}; tracking needs at least ${MIN_FRAMES}, so give a longer clip or window`);
    }
    const n = store.n;
    const candidates = !multi ? follower?.paths : null;
    if (candidates) {
      const { index: k, note } = pickMarkerTrackWithNote(candidates, centre);
      if (note) warnings.push(`${note[0]!.toUpperCase()}${note.slice(1)}.`);
      for (let i = 0; i < n; i++) {
        if (store.flag[i] === 'lost:camera') continue;
        store.x[i] = candidates.x_px[k][i];
        store.y[i] = candidates.y_px[k][i];
        store.sx[i] = candidates.sx_px[k][i];
        store.sy[i] = candidates.sy_px[k][i];
        store.q[i] = candidates.quality[k][i];
        store.flag[i] = candidates.flag[k][i];
      }
      // the first frames were taken before the marker's size was known: something merged with it then is refused now
      for (const i of earlySizeOutliers(candidates.area_px[k].subarray(0, n), candidates.size_held[k].subarray(0, n), (j) => store.flag[j] === '')) {
        store.x[i] = store.y[i] = store.sx[i] = store.sy[i] = Number.NaN;
        store.q[i] = 0;
        store.flag[i] = 'lost:shape';
      }
    }
    const t_s = store.t.subarray(0, n);
    const quality = store.q.subarray(0, n);
    const flag = store.flag;

    // ---- geometry ----
    let view: ViewGeometry | null = null;
    let viewSummary: TrackSummary['view'] = null;
    let centreSummary: TrackSummary['centre'];
    let fit: RobustEllipseFit | null = null;
    const wrapped = new Float64Array(n).fill(NaN);
    let maxCorrection = 0;
    let multiSummary: Pick<TrackSummary, 'markers' | 'path_fit'> | null = null;
    if (mode.kind === 'texture') {
      const c = texture!.centre_px;
      centreSummary = { x_px: givenQuantity(c.x_px), y_px: givenQuantity(c.y_px), source: 'given' };
      for (let i = 0; i < n; i++) wrapped[i] = Number.isFinite(store.a[i]) ? wrapDeg(store.a[i]) : NaN;
    } else if (multi) {
      const g = multiMarkerGeometry({
        store: multi.paths, t_s, frame_number: store.frame, frame: { flag, quality, x_px: store.x, y_px: store.y }, centre, tilt_deg: options.tilt_deg, tilt_axis_deg: options.tilt_axis_deg,
        roi_text: `${roi.x},${roi.y},${roi.w},${roi.h}`, marker_text: markerWord(mode), warnings,
      });
      ({ view, view_summary: viewSummary, centre_summary: centreSummary } = g);
      wrapped.set(g.wrapped_deg);
      multiSummary = { markers: g.markers, path_fit: g.path_fit ?? undefined };
    } else {
      const good: number[] = [];
      for (let i = 0; i < n; i++) if (flag[i] === '') good.push(i);
      if (good.length < MIN_FRAMES) {
        if (mode.kind === 'color' && colourSeen === 0) {
          throw new InputError(`no pixel in ${regionWords} comes within ΔE ${tolerance} of --marker color:${mode.hex.slice(1)}; check the colour (pick it from a frame) or the region`);
        }
        throw new InputError(`no ${markerWord(mode)} marker was found in ${regionWords} (found in ${good.length} of ${n} frames); check --marker, and give --roi around the marker's circle`);
      }
      const gx = Float64Array.from(good, (i) => store.sx[i]);
      const gy = Float64Array.from(good, (i) => store.sy[i]);
      let cx: number;
      let cy: number;
      if (centre) {
        cx = centre.x_px;
        cy = centre.y_px;
      } else {
        const { circle, arc_deg: arc } = pathCircle(gx, gy);
        const skipped = follower?.unfollowed ?? 0;
        if (!(arc >= 1) && skipped > 0) {
          throw new InputError(
            `the spot followed did not move, and the first frame showed ${skipped} more spot${skipped === 1 ? '' : 's'} than could be followed (the biggest were), so the marker may not have been among them; give --roi around the marker's circle`,
          );
        }
        if (!(arc >= MIN_ARC_FREE_DEG)) {
          throw new InputError(
            `the marker swept only ${arc.toFixed(0)}° of its circle, too little to fit the centre and view; give --center x,y (and the tilt in degrees with --tilt if the camera is not square to the axis)`,
          );
        }
        cx = circle.cx_px;
        cy = circle.cy_px;
      }
      const arcAbout = arcCoverage(gx, gy, cx, cy);
      if (centre) {
        const off = givenCentreOffset(gx, gy, centre);
        if (off) warnings.push(`The marker's path is centred near ${off.x_px.toFixed(1)},${off.y_px.toFixed(1)} px, ${off.distance_px.toFixed(1)} px from --center ${centre.x_px},${centre.y_px}; a wrong centre shows up as a false tilt and a wobbling rate, so check --center (or leave it out: this path sweeps enough to fit it).`);
      }
      const canFit = centre ? arcAbout >= MIN_ARC_CENTRED_DEG : true;
      fit = canFit ? fitPathEllipse(gx, gy, centre) : null;
      if (canFit && !fit && !centre) {
        throw new InputError(`the marker's detections in ${regionWords} do not lie on an ellipse, so its centre cannot be fitted; give --center x,y, and check --roi and --marker (something else may have been followed)`);
      }
      if (canFit && !fit) {
        const ignored: string[] = [];
        ({ view, view_summary: viewSummary, centre_summary: centreSummary } = viewWithoutPathFit(cx, cy, { centre, tilt_deg: options.tilt_deg, tilt_axis_deg: options.tilt_axis_deg }, arcAbout, 'The marker', ignored));
        warnings.push(`The marker's detections do not lie on an ellipse about --center, so the view could not be measured; ${options.tilt_deg === undefined ? 'angles assume a square-on camera (give the tilt in degrees with --tilt if it is not)' : `angles use the given --tilt ${options.tilt_deg}°`}; check preview.png for something else followed.`);
      } else if (fit) {
        // frames far off the fitted path are not trusted
        for (let k = 0; k < good.length; k++) {
          if (!fit.inlier[k]) {
            const i = good[k];
            flag[i] = 'lost:off-path';
            quality[i] = 0;
          }
        }
        const e = fit.ellipse;
        ({ view, view_summary: viewSummary, centre_summary: centreSummary } = viewFromPathFit(
          { ellipse: e, axis_ratio: e.semi_minor_px / e.semi_major_px, se: fit.se, ci95: fit.ci95 },
          { centre, tilt_deg: options.tilt_deg, tilt_axis_deg: options.tilt_axis_deg },
        ));
      } else {
        ({ view, view_summary: viewSummary, centre_summary: centreSummary } = viewWithoutPathFit(
          cx, cy, { centre, tilt_deg: options.tilt_deg, tilt_axis_deg: options.tilt_axis_deg }, arcAbout, 'The marker', warnings,
        ));
      }
      // a marker keeps its distance from the axis; a drifting particle or a corner of the region does not
      const kept = good.filter((i) => flag[i] === '');
      const { off } = offCircle(Float64Array.from(kept, (i) => store.sx[i]), Float64Array.from(kept, (i) => store.sy[i]), view);
      let offCount = 0;
      for (let k = 0; k < kept.length; k++) {
        if (off[k]) {
          flag[kept[k]] = 'lost:off-path';
          quality[kept[k]] = 0;
          offCount++;
        }
      }
      if (offCount > OFF_CIRCLE_WARN_SHARE * kept.length) {
        warnings.push(
          `${((100 * offCount) / kept.length).toFixed(0)}% of the marker detections lie off a circle about the centre ${view.cx_px.toFixed(1)},${view.cy_px.toFixed(1)}, so the follower may have followed something else (a drifting particle, a reflection, an edge); check preview.png, --roi and --center.`,
        );
      }
      const plain: ViewGeometry = { cx_px: view.cx_px, cy_px: view.cy_px, axis_ratio: 1, major_axis_deg: 0 };
      for (let i = 0; i < n; i++) {
        if (flag[i] !== '') continue;
        wrapped[i] = rotorPlaneAngle(store.sx[i], store.sy[i], view);
        const raw = rotorPlaneAngle(store.sx[i], store.sy[i], plain);
        maxCorrection = Math.max(maxCorrection, Math.abs(wrapDeg(wrapped[i] - raw)));
      }
      if (viewSummary) viewSummary.max_correction_deg = maxCorrection;
    }

    // ---- unwrap ----
    const unwrapped = unwrapAngles(t_s, wrapped);
    const steps = Array.from(unwrapped.step_deg).sort((a, b) => a - b);
    const p95 = steps.length ? steps[Math.min(steps.length - 1, Math.floor(0.95 * steps.length))] : 0;
    if (p95 > 60) {
      warnings.push(`The hub turns up to ${p95.toFixed(0)}° between frames, close to the 180° aliasing limit of a single marker; film at a higher frame rate or check the direction by eye.`);
    }
    const spacing = multiSummary?.markers ? closestSpacingDeg(multiSummary.markers.phase_offset_deg) : Infinity;
    if (p95 > spacing / 2) {
      warnings.push(`The hub turns up to ${p95.toFixed(0)}° between frames, more than half the smallest angle between two markers (${spacing.toFixed(0)}° as measured), so a marker may have been taken for its neighbour; look for jumps in the angle, and film at a higher frame rate or space the markers further apart.`);
    }
    for (const s of unwrapped.splits) {
      warnings.push(`The marker was lost for ${s.gap_s.toFixed(2)} s after ${s.t_s.toFixed(3)} s, too long to count the turns; the series is split there and the turn count after it is a best guess.`);
    }
    const lostByReason: Record<string, number> = {};
    let lost = 0;
    for (let i = 0; i < n; i++) {
      if (flag[i] !== '') {
        lost++;
        lostByReason[flag[i]] = (lostByReason[flag[i]] ?? 0) + 1;
      }
    }
    if (lost > 0.1 * n) {
      const skipped = follower?.unfollowed ?? 0;
      const why = skipped > 0 ? `; the first frame showed ${skipped} more spot${skipped === 1 ? '' : 's'} than were followed (the ${centre ? 'nearest to --center' : 'biggest'}), so the marker may not have been among them: give --roi around the marker's circle` : '';
      warnings.push(`The marker was lost in ${((100 * lost) / n).toFixed(0)}% of frames; check the region, the marker kind and the preview${why}.`);
    }

    const series: AngleSeries = {
      frame: Int32Array.from(store.frame.subarray(0, n)),
      t_s: Float64Array.from(t_s),
      x_px: Float64Array.from(store.x.subarray(0, n)),
      y_px: Float64Array.from(store.y.subarray(0, n)),
      angle_deg: unwrapped.angle_deg,
      quality: Float64Array.from(quality),
      flag: flag.slice(0, n),
    };
    for (let i = 0; i < n; i++) {
      if (series.flag[i] !== '') {
        series.x_px[i] = NaN;
        series.y_px[i] = NaN;
        series.angle_deg[i] = NaN;
      }
    }
    const timing = frameTiming(t_s);
    const hash = await hashing;
    const pathSample: { x_px: number; y_px: number }[] = [];
    const every = Math.max(1, Math.ceil(n / 400));
    for (let i = 0; i < n; i += every) if (Number.isFinite(series.x_px[i])) pathSample.push({ x_px: series.x_px[i], y_px: series.y_px[i] });
    const otherSamples = multi ? otherMarkerSamples(multi.paths, 400) : [];

    const summary: TrackSummary = {
      software: { ...SOFTWARE },
      input: {
        path,
        size_bytes: hash.size_bytes,
        sha256: hash.sha256,
        width: header.width,
        height: header.height,
        frame_count: n,
        nominal_fps: timing.median_fps,
        variable_frame_rate: timing.variable_frame_rate,
      },
      settings: {
        roi: [roi.x, roi.y, roi.w, roi.h],
        centre: centre ? [centre.x_px, centre.y_px] : null,
        marker: mode.kind === 'color' ? `color:${mode.hex}` : mode.kind,
        colour_tolerance: mode.kind === 'color' ? tolerance : null,
        anchor: anchor ? [anchor.x, anchor.y, anchor.w, anchor.h] : null,
        from_s: options.from_s ?? null,
        to_s: options.to_s ?? null,
        tilt_deg: options.tilt_deg ?? null,
        tilt_axis_deg: options.tilt_axis_deg ?? null,
        decoded_region: [crop.x, crop.y, crop.w, crop.h],
        angle_zero: mode.kind === 'texture' ? 'first frame' : 'marker angle about the centre at the first good frame, from image +x',
        unwrap: { max_ambiguity_deg: 90, rate_change_fraction: 0.25 },
      },
      centre: centreSummary,
      view: viewSummary,
      camera_motion: anchor
        ? { anchor: [anchor.x, anchor.y, anchor.w, anchor.h], max_shift_px: shiftMax, max_rotation_deg: rotMax, rms_shift_px: motionCount ? Math.sqrt(shiftSs / motionCount) : NaN }
        : null,
      frames: { decoded: n, lost, lost_by_reason: lostByReason },
      splits: unwrapped.splits.map((s) => ({ after_frame: series.frame[s.after_index], t_s: s.t_s, gap_s: s.gap_s })),
      path_sample: [...pathSample, ...otherSamples.flat()],
      warnings,
    };
    if (fit) summary.path_fit = { rms_px: fit.rms_px, rejected: countZeros(fit.inlier) };
    if (multi && multiSummary) {
      summary.settings.markers = markerCount;
      summary.settings.angle_zero = 'first marker angle about the centre at the first good frame, from image +x (markers numbered counterclockwise from +x at the first frame all are seen)';
      if (multiSummary.path_fit) summary.path_fit = multiSummary.path_fit;
      summary.markers = multiSummary.markers;
    }

    const preview = await previewFrame;
    markPreview(preview, {
      roi,
      anchor,
      view,
      centre: { x_px: centreSummary.x_px.value, y_px: centreSummary.y_px.value },
      detections: pathSample.slice(0, 400),
      ...(multi ? { other_markers: otherSamples } : {}),
    });
    return { series, summary, preview };
  } finally {
    side.abort();
  }
}

/** Smallest angle between any two markers' phase offsets (deg, around the circle); Infinity for one marker. */
function closestSpacingDeg(phase_offset_deg: readonly number[]): number {
  let least = Infinity;
  for (let a = 0; a < phase_offset_deg.length; a++) {
    for (let b = a + 1; b < phase_offset_deg.length; b++) least = Math.min(least, Math.abs(wrapDeg(phase_offset_deg[a] - phase_offset_deg[b])));
  }
  return least;
}

/** The least-squares circle through a marker path (evenly thinned to at most 2000 points, px) and the arc it sweeps about that circle's centre, deg. */
function pathCircle(x: Float64Array, y: Float64Array): { circle: Circle; arc_deg: number } {
  const stride = Math.max(1, Math.ceil(x.length / 2000));
  const tx = x.filter((_, k) => k % stride === 0);
  const ty = y.filter((_, k) => k % stride === 0);
  const circle = fitCircle(tx, ty);
  return { circle, arc_deg: arcCoverage(tx, ty, circle.cx_px, circle.cy_px) };
}

/**
 * Where a path that sweeps enough of its circle (≥ MIN_ARC_FREE_DEG) is centred by itself (circle fit, px), when
 * that lies more than max(3 px, 3 % of its radius) from the given centre; null otherwise (or too short a path).
 */
function givenCentreOffset(x: Float64Array, y: Float64Array, centre: { x_px: number; y_px: number }): { x_px: number; y_px: number; distance_px: number } | null {
  const { circle, arc_deg } = pathCircle(x, y);
  if (!(arc_deg >= MIN_ARC_FREE_DEG)) return null;
  const distance_px = Math.hypot(circle.cx_px - centre.x_px, circle.cy_px - centre.y_px);
  return distance_px > Math.max(3, 0.03 * circle.r_px) ? { x_px: circle.cx_px, y_px: circle.cy_px, distance_px } : null;
}

/** Up to `most` evenly spaced measured positions of each marker after the first, px (for the preview). */
function otherMarkerSamples(paths: MarkerPathStore, most: number): { x_px: number; y_px: number }[][] {
  const out: { x_px: number; y_px: number }[][] = [];
  for (let k = 1; k < paths.count; k++) {
    const kept: { x_px: number; y_px: number }[] = [];
    for (let i = 0; i < paths.n; i++) if (paths.flag[k][i] === '') kept.push({ x_px: paths.x_px[k][i], y_px: paths.y_px[k][i] });
    const every = Math.max(1, Math.ceil(kept.length / most));
    out.push(kept.filter((_, j) => j % every === 0));
  }
  return out;
}

function resolveCentre(c: TrackOptions['centre']): { x_px: number; y_px: number } | null {
  if (!c) return null;
  const x = c.x_px ?? c.x;
  const y = c.y_px ?? c.y;
  if (!Number.isFinite(x) || !Number.isFinite(y)) throw new InputError(`--center must be two numbers x,y in pixels`);
  return { x_px: x as number, y_px: y as number };
}

function union(a: RegionPx, b: RegionPx): RegionPx {
  const x = Math.min(a.x, b.x);
  const y = Math.min(a.y, b.y);
  return { x, y, w: Math.max(a.x + a.w, b.x + b.w) - x, h: Math.max(a.y + a.h, b.y + b.h) - y };
}

function countZeros(a: Uint8Array): number {
  let z = 0;
  for (const v of a) if (!v) z++;
  return z;
}

function markerWord(mode: MarkerMode): string {
  return mode.kind === 'color' ? `color:${mode.hex}` : mode.kind;
}

/** Growable per-frame columns (typed arrays, doubled when full). */
class FrameStore {
  n = 0;
  frame = new Int32Array(1024);
  t = new Float64Array(1024);
  x = new Float64Array(1024);
  y = new Float64Array(1024);
  sx = new Float64Array(1024);
  sy = new Float64Array(1024);
  a = new Float64Array(1024);
  q = new Float64Array(1024);
  flag: string[] = [];
  push(frame: number, t: number, x: number, y: number, sx: number, sy: number, a: number, q: number, flag: string): void {
    if (this.n === this.t.length) {
      this.frame = doubleCapacity(this.frame);
      this.t = doubleCapacity(this.t);
      this.x = doubleCapacity(this.x);
      this.y = doubleCapacity(this.y);
      this.sx = doubleCapacity(this.sx);
      this.sy = doubleCapacity(this.sy);
      this.a = doubleCapacity(this.a);
      this.q = doubleCapacity(this.q);
    }
    const i = this.n++;
    this.frame[i] = frame;
    this.t[i] = t;
    this.x[i] = x;
    this.y[i] = y;
    this.sx[i] = sx;
    this.sy[i] = sy;
    this.a[i] = a;
    this.q[i] = q;
    this.flag.push(flag);
  }
}

export type { VideoHeader };
