import type { TopLevelSpec } from 'vega-lite';
import type { ChartSpec } from './ChartSpec.js';
import { formatFixed, formatSig, modelLabel } from './formatQuantity.js';
import { modelCurve } from './modelCurve.js';
import { PALETTE } from './reportStyle.js';
import type { RunData } from './ReportData.js';
import { thinBand, thinSeries } from './thinSeries.js';

export interface RunChartOptions {
  /** Buckets for min/max thinning of long series, default 240. */
  buckets?: number;
  /** Chart size in px, default 460 × 170. */
  width?: number;
  height?: number;
}

const SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';
const num = (v: number): number | null => (Number.isFinite(v) ? Math.round(v * 1e6) / 1e6 : null);

/** Rows for a line: NaN becomes null so the line breaks there. */
function lineRows(t_s: ArrayLike<number>, y: ArrayLike<number>, series: string): { t: number; y: number | null; series: string }[] {
  const rows = [];
  for (let i = 0; i < t_s.length; i++) rows.push({ t: num(t_s[i]!)!, y: num(y[i]!), series });
  return rows;
}

/** Every per-run chart that the run's files allow, with captions. */
export function runChartSpecs(run: RunData, options: RunChartOptions = {}): ChartSpec[] {
  const buckets = options.buckets ?? 240;
  const width = options.width ?? 460;
  const height = options.height ?? 170;
  const charts: ChartSpec[] = [];
  const { angle, rate, fit, track } = run;
  const base = { $schema: SCHEMA, width, height } as const;
  const tAxis = { field: 't', type: 'quantitative', title: 'time (s)', scale: { nice: false, zero: false } } as const;
  const thinNote = (n: number): string => (n > 2 * buckets ? ` The ${n} frames are drawn as the lowest and highest value in each of ${buckets} time bins, so extremes stay visible; breaks mark lost frames.` : ' Breaks mark lost frames.');

  const curve = angle && fit ? modelCurve(fit, angle.t_s, angle.angle_deg) : null;
  if (angle && angle.t_s.length > 0) {
    const data = thinSeries(angle.t_s, angle.angle_deg, { buckets });
    const rows = lineRows(data.t_s, data.y, 'tracked');
    const layers: object[] = [];
    if (fit) layers.push({ data: { values: [{ t0: fit.window_s[0], t1: fit.window_s[1] }] }, mark: { type: 'rect', color: '#eef1f5' }, encoding: { x: { field: 't0', type: 'quantitative' }, x2: { field: 't1' } } });
    if (curve) {
      const m = thinSeries(angle.t_s, curve.angle_deg, { buckets: 120 });
      layers.push({ data: { values: lineRows(m.t_s, m.y, 'model') }, mark: { type: 'line', color: PALETTE.model, strokeDash: [8, 4], strokeWidth: 3, opacity: 0.7 }, encoding: { x: { field: 't', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } } });
    }
    layers.push({ data: { values: rows }, mark: { type: 'line', color: PALETTE.data, strokeWidth: 1.2 }, encoding: { x: tAxis, y: { field: 'y', type: 'quantitative', title: 'angle (deg, CCW +)', scale: { zero: false } } } });
    charts.push({
      id: 'angle',
      title: 'Angle against time with the fitted model',
      caption: `Thin solid line: tracked angle. ${curve ? `Thick dashed line underneath: fitted ${modelLabel(fit!.model)} model. ${curve.how}` : 'No fitted model to draw.'}${fit ? ' Shaded: the fit window.' : ''}${thinNote(angle.t_s.length)}`,
      spec: { ...base, layer: layers } as TopLevelSpec,
    });
    if (curve) {
      const resid = new Float64Array(angle.t_s.length);
      for (let i = 0; i < resid.length; i++) {
        const inWindow = angle.t_s[i]! >= fit!.window_s[0] && angle.t_s[i]! <= fit!.window_s[1];
        resid[i] = inWindow ? angle.angle_deg[i]! - curve.angle_deg[i]! : Number.NaN;
      }
      const r = thinSeries(angle.t_s, resid, { buckets });
      charts.push({
        id: 'residuals',
        title: 'Residuals (tracked minus model)',
        caption: `Inside the fit window only; RMS ${formatSig(fit!.diagnostics.residual_rms_deg, 3)} deg as reported by the fit.${thinNote(angle.t_s.length)}`,
        spec: {
          ...base,
          layer: [
            { data: { values: [{ y: 0 }] }, mark: { type: 'rule', color: PALETTE.muted }, encoding: { y: { field: 'y', type: 'quantitative' } } },
            { data: { values: lineRows(r.t_s, r.y, 'residual') }, mark: { type: 'line', color: PALETTE.data, strokeWidth: 1 }, encoding: { x: tAxis, y: { field: 'y', type: 'quantitative', title: 'residual (deg)' } } },
          ],
        } as TopLevelSpec,
      });
    }
  }

  if (rate && rate.t_s.length > 0) {
    const band = thinBand(rate.t_s, rate.lo_deg_s, rate.hi_deg_s, { buckets });
    const bandRows = [];
    for (let i = 0; i < band.t_s.length; i++) bandRows.push({ t: num(band.t_s[i]!), lo: num(band.lo[i]!), hi: num(band.hi[i]!) });
    const line = thinSeries(rate.t_s, rate.rate_deg_s, { buckets });
    const layers: object[] = [
      { data: { values: bandRows }, mark: { type: 'area', color: PALETTE.band, opacity: 0.55 }, encoding: { x: tAxis, y: { field: 'lo', type: 'quantitative', title: 'rate (deg/s)', scale: { zero: false } }, y2: { field: 'hi' } } },
      { data: { values: lineRows(line.t_s, line.y, 'smoothed') }, mark: { type: 'line', color: PALETTE.data, strokeWidth: 1.4 }, encoding: { x: { field: 't', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } } },
    ];
    let modelText = '';
    if (curve && angle && fit && fit.model !== 'steady') {
      const m = thinSeries(angle.t_s, curve.rate_deg_s, { buckets: 120 });
      layers.push({ data: { values: lineRows(m.t_s, m.y, 'model') }, mark: { type: 'line', color: PALETTE.model, strokeDash: [6, 3], strokeWidth: 1.6 }, encoding: { x: { field: 't', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } } });
      modelText = ` Dashed: the fitted ${fit.model === 'spinup' ? 'spin-up' : 'coast-down'} model.`;
    } else if (fit?.steady) {
      layers.push({ data: { values: [{ y: fit.steady.rate_deg_s.value }] }, mark: { type: 'rule', color: PALETTE.model, strokeDash: [6, 3], strokeWidth: 1.6 }, encoding: { y: { field: 'y', type: 'quantitative' } } });
      modelText = ' Dashed: the fitted steady rate.';
    }
    charts.push({
      id: 'rate',
      title: 'Smoothed rate against time',
      caption: `Line: smoothed rate from rate.csv; band: its pointwise interval (widest per time bin), which describes noise, not smoothing: where the rate bends sharply (a spin-up's start) the true rate can lie outside it.${modelText}`,
      spec: { ...base, layer: layers } as TopLevelSpec,
    });
  }

  if (fit?.model === 'steady' && fit.steady && fit.steady.segments.length > 0) {
    const st = fit.steady;
    const rows = st.segments.map((s, i) => ({ t: num((s.t0_s + s.t1_s) / 2), t0: num(s.t0_s), t1: num(s.t1_s), y: num(s.rate_deg_s.value), lo: num(s.rate_deg_s.ci[0]), hi: num(s.rate_deg_s.ci[1]), segment: i + 1 }));
    charts.push({
      id: 'segments',
      title: 'Segment rates with intervals',
      caption: `Each mark is the rate over one segment of the window with its ${Math.round(100 * st.rate_deg_s.level)}% interval; the band and line are the overall steady rate and its interval. Segments that disagree beyond their intervals point to a rate that drifts.`,
      spec: {
        ...base,
        layer: [
          { data: { values: [{ lo: st.rate_deg_s.ci[0], hi: st.rate_deg_s.ci[1], y: st.rate_deg_s.value }] }, mark: { type: 'rect', color: PALETTE.band, opacity: 0.45 }, encoding: { y: { field: 'lo', type: 'quantitative' }, y2: { field: 'hi' } } },
          { data: { values: [{ y: st.rate_deg_s.value }] }, mark: { type: 'rule', color: PALETTE.model, strokeDash: [6, 3] }, encoding: { y: { field: 'y', type: 'quantitative' } } },
          { data: { values: rows }, mark: { type: 'rule', color: PALETTE.data, strokeWidth: 1.5 }, encoding: { x: { field: 't', type: 'quantitative', title: 'segment middle (s)', scale: { zero: false, padding: 12 } }, y: { field: 'lo', type: 'quantitative', title: 'rate (deg/s)', scale: { zero: false } }, y2: { field: 'hi' } } },
          { data: { values: rows }, mark: { type: 'point', shape: 'square', filled: true, color: PALETTE.data, size: 36 }, encoding: { x: { field: 't', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } } },
        ],
      } as TopLevelSpec,
    });
  }

  if (track && (track.path_sample.length > 0 || track.view)) {
    const pts = track.path_sample.map((p) => ({ x: num(p.x_px), y: num(p.y_px) }));
    const cx = track.centre.x_px.value;
    const cy = track.centre.y_px.value;
    const ellipse: { x: number | null; y: number | null; k: number; m: number }[] = [];
    if (track.view) {
      // one path per marker: the shared shape (axis ratio, direction) at each marker's own size
      const ratio = track.view.semi_minor_px / track.view.semi_major_px;
      const sizes = track.markers?.semi_major_px ?? [track.view.semi_major_px];
      const phi = (track.view.major_axis_deg * Math.PI) / 180;
      sizes.forEach((a, m) => {
        const b = a * ratio;
        for (let k = 0; k <= 120; k++) {
          const u = (2 * Math.PI * k) / 120;
          // counterclockwise as displayed: image y points down
          const ex = a * Math.cos(u) * Math.cos(phi) - b * Math.sin(u) * Math.sin(phi);
          const ey = a * Math.cos(u) * Math.sin(phi) + b * Math.sin(u) * Math.cos(phi);
          ellipse.push({ x: num(cx + ex), y: num(cy - ey), k, m });
        }
      });
    }
    const drawn = ellipse.some((p) => p.x !== null && p.y !== null); // a view assumed square-on (no fit) has no size to draw
    const xs = [...pts.map((p) => p.x ?? cx), ...ellipse.map((p) => p.x ?? cx), cx];
    const ys = [...pts.map((p) => p.y ?? cy), ...ellipse.map((p) => p.y ?? cy), cy];
    const half = Math.max(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys)) / 2 * 1.08 || 10;
    const mx = (Math.max(...xs) + Math.min(...xs)) / 2;
    const my = (Math.max(...ys) + Math.min(...ys)) / 2;
    const side = 260;
    // equal scales on both axes: two invisible corner points fix the square extent (kept as data, so the chart structure is shared)
    const corners = [{ x: num(mx - half), y: num(my - half) }, { x: num(mx + half), y: num(my + half) }];
    const xScale = { nice: false, zero: false };
    const yScale = { nice: false, zero: false, reverse: true };
    charts.push({
      id: 'path',
      title: drawn ? 'Marker path, fitted ellipse and centre' : 'Marker path and centre',
      caption: `Dots: marker positions (a sample, full-frame pixels, y down as in the video${track.markers ? `; all ${track.markers.count} markers` : ''}). ${drawn && track.view ? `Line: fitted ellipse${track.markers ? ', one per marker' : ''} (axis ratio ${formatFixed(track.view.axis_ratio, 3)}). ` : ''}Cross: centre (${track.centre.source === 'given' ? 'given' : 'fitted'}, ${formatFixed(cx, 1)}, ${formatFixed(cy, 1)} px).`,
      spec: {
        $schema: SCHEMA,
        width: side,
        height: side,
        layer: [
          { data: { values: corners }, mark: { type: 'point', opacity: 0, size: 1 }, encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } } },
          { data: { values: pts }, mark: { type: 'point', filled: true, size: 16, opacity: 0.7, color: PALETTE.data }, encoding: { x: { field: 'x', type: 'quantitative', title: 'x (px)', scale: xScale }, y: { field: 'y', type: 'quantitative', title: 'y (px, down)', scale: yScale } } },
          ...(drawn ? [{ data: { values: ellipse }, mark: { type: 'line', color: PALETTE.model, strokeWidth: 1.2, strokeDash: [6, 3] }, encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' }, detail: { field: 'm', type: 'nominal' }, order: { field: 'k', type: 'quantitative' } } }] : []),
          { data: { values: [{ x: cx, y: cy }] }, mark: { type: 'point', shape: 'cross', filled: true, size: 140, color: PALETTE.ink }, encoding: { x: { field: 'x', type: 'quantitative' }, y: { field: 'y', type: 'quantitative' } } },
        ],
      } as TopLevelSpec,
    });
  }

  if (angle && angle.t_s.length > 0) {
    // quality of the frames that were tracked; lost or flagged frames are the bars, not a dip in the line
    const trackedQuality = Float64Array.from(angle.quality, (v, i) => (angle.flagged[i] || !Number.isFinite(angle.angle_deg[i]!) ? Number.NaN : v));
    const q = thinSeries(angle.t_s, trackedQuality, { buckets, skip_missing: true });
    const n = angle.t_s.length;
    const nb = Math.min(buckets, n);
    const size = n / nb;
    const lostRows = [];
    for (let b = 0; b < nb; b++) {
      const i0 = Math.floor(b * size);
      const i1 = Math.min(n, Math.max(i0 + 1, Math.floor((b + 1) * size)));
      let lost = 0;
      for (let i = i0; i < i1; i++) if (angle.flagged[i] || !Number.isFinite(angle.angle_deg[i]!)) lost++;
      if (lost > 0) lostRows.push({ t0: num(angle.t_s[i0]!), t1: num(angle.t_s[i1 - 1]! + (angle.t_s[Math.min(n - 1, i1)]! - angle.t_s[i1 - 1]!)), share: num(lost / (i1 - i0)), base: 0 });
    }
    const totalLost = angle.flagged.reduce((s, v, i) => s + (v || !Number.isFinite(angle.angle_deg[i]!) ? 1 : 0), 0);
    charts.push({
      id: 'quality',
      title: 'Tracking quality and lost frames over time',
      caption: `Line: tracking quality of the frames tracked (0 = none, 1 = best; lowest and highest per time bin). Bars: share of frames flagged or lost in each bin (${totalLost} of ${n} frames in all).`,
      spec: {
        ...base,
        layer: [
          { data: { values: lostRows.length > 0 ? lostRows : [{ t0: num(angle.t_s[0]!), t1: num(angle.t_s[0]!), share: 0, base: 0 }] }, mark: { type: 'rect', color: PALETTE.lost, opacity: 0.75 }, encoding: { x: { field: 't0', type: 'quantitative', title: 'time (s)', scale: { nice: false, zero: false } }, x2: { field: 't1' }, y: { field: 'base', type: 'quantitative', scale: { domain: [0, 1] } }, y2: { field: 'share' } } },
          { data: { values: lineRows(q.t_s, q.y, 'quality') }, mark: { type: 'line', color: PALETTE.data, strokeWidth: 1.2 }, encoding: { x: { field: 't', type: 'quantitative' }, y: { field: 'y', type: 'quantitative', title: 'quality · lost share', scale: { domain: [0, 1] } } } },
        ],
      } as TopLevelSpec,
    });
  }
  return charts;
}
