import type { RunData } from './ReportData.js';
import { formatFixed, formatSig } from './formatQuantity.js';

/** One data-quality finding about a run, in plain words. */
export interface QualityNote {
  /** Short label, e.g. a flag as written in angle.csv. */
  label: string;
  words: string;
  /** True when it can change the conclusion (shown among the warnings at the top). */
  serious: boolean;
}

const pct = (x: number): string => `${formatFixed(100 * x, x < 0.01 ? 2 : 1)}%`;

/** Plain-word meaning of a frame flag from angle.csv, by the words it contains. */
export function explainFlag(flag: string, count: number, total: number): string {
  const share = total > 0 ? ` (${pct(count / total)} of frames)` : '';
  const f = flag.toLowerCase();
  const frames = `${count} frame${count === 1 ? '' : 's'}${share}`;
  if (/gate|jump/.test(f)) return `${frames}: the marker seemed to jump further than the rotor can turn between two frames, so the position was set aside as probably a bubble, particle or reflection.`;
  if (/blob|no-marker|not-found|missing|none/.test(f)) return `${frames}: no marker was found — it may have been hidden by a bubble or glare, or left the region of interest.`;
  if (/quality|weak|contrast|ambig/.test(f)) return `${frames}: the marker was found but too faintly or ambiguously to trust.`;
  if (/decode|drop|dup/.test(f)) return `${frames}: the video itself had a problem at these frames (dropped, repeated or undecodable).`;
  if (/shake|motion|anchor/.test(f)) return `${frames}: the camera moved too much to correct reliably.`;
  if (/glare|flicker|bright|exposure/.test(f)) return `${frames}: the lighting changed sharply (flicker or glare).`;
  if (/split|gap/.test(f)) return `${frames}: a gap too long to bridge safely; the angle count restarts after it.`;
  return `${frames} carry this flag; it has no longer explanation here — see angle.csv.`;
}

/** Data-quality findings for a run: flags, lost frames, camera, fit diagnostics and the stages' own warnings. */
export function qualityNotes(run: RunData): QualityNote[] {
  const notes: QualityNote[] = [];
  const { record, track, fit, angle } = run;
  if (record.status === 'failed') notes.push({ label: 'run failed', words: record.error ?? 'The run failed without a recorded reason.', serious: true });
  for (const p of run.problems) notes.push({ label: 'missing file', words: p, serious: true });
  if (angle) {
    const total = angle.t_s.length;
    for (const [flag, count] of Object.entries(angle.flag_counts).sort((a, b) => b[1] - a[1])) {
      notes.push({ label: flag, words: explainFlag(flag, count, total), serious: count / Math.max(1, total) > 0.05 });
    }
  }
  const lost = record.lost_share ?? fit?.diagnostics.lost_share ?? null;
  if (lost !== null && lost > 0.05) notes.push({ label: 'many lost frames', words: `${pct(lost)} of frames were lost; the rate rests on the rest, but check the quality chart for long gaps.`, serious: true });
  if (track) {
    if (track.input.variable_frame_rate) notes.push({ label: 'variable frame rate', words: 'The video has a variable frame rate (typical of phones); each frame’s own time stamp was used, not a nominal rate.', serious: false });
    const v = track.view;
    if (v && v.axis_ratio < 0.97) {
      notes.push({
        label: 'oblique camera',
        words: `The marker path is an ellipse (axis ratio ${formatFixed(v.axis_ratio, 3)}, about ${formatFixed(v.tilt_deg?.value, 1)}° from face-on); ${v.corrected ? `angles were corrected for it (largest correction ${formatFixed(v.max_correction_deg, 1)}°).` : 'angles were not corrected for it.'}`,
        serious: !v.corrected && v.axis_ratio < 0.9,
      });
    }
    const cm = track.camera_motion;
    if (cm && cm.max_shift_px > 1) notes.push({ label: 'camera moved', words: `The camera moved by up to ${formatFixed(cm.max_shift_px, 1)} px and turned by up to ${formatFixed(cm.max_rotation_deg, 2)}°; this was measured against a fixed anchor and removed.`, serious: false });
    if (track.splits.length > 0) notes.push({ label: 'track split', words: `The track was interrupted ${track.splits.length} time${track.splits.length === 1 ? '' : 's'} for longer than can be bridged safely (longest ${formatFixed(Math.max(...track.splits.map((s) => s.gap_s)), 2)} s); the angle count restarts after each break.`, serious: true });
    for (const w of track.warnings) notes.push({ label: 'tracking', words: w, serious: true });
  }
  if (fit) {
    const r1 = fit.diagnostics.residual_autocorrelation[0];
    if (r1 !== undefined && r1 > 0.5) notes.push({ label: 'correlated residuals', words: `Residuals are strongly correlated from frame to frame (lag-1 correlation ${formatFixed(r1, 2)}): ${fit.model === 'steady' ? 'the rotor does not turn perfectly evenly or the marker wobbles' : 'the rotor does not turn perfectly evenly, the marker wobbles, or the model does not follow the data'}; the intervals allow for correlated noise (see Methods).`, serious: false });
    if (fit.selection?.ambiguous) notes.push({ label: 'model choice unclear', words: 'Two models describe the angle about equally well; the chosen one is shown, but the other is nearly as good.', serious: true });
    const z = fit.steady?.zero_test;
    if (z && fit.steady && z.p_value >= 1 - fit.steady.rate_deg_s.level) {
      notes.push({ label: 'rate near zero', words: `The rate is not distinguishable from zero (p = ${formatSig(z.p_value, 2)}); this run would detect a rate of about ${formatSig(fit.steady.min_detectable_deg_s, 2)} deg/s.`, serious: false });
    }
    for (const w of fit.diagnostics.warnings) {
      // a note about a candidate model that was not chosen (e.g. "spin-up could not be fitted") is not a warning about the result
      const named = [...w.toLowerCase().matchAll(/\b(steady|spin-?up|spin-?down|coast-?down)\b/g)].map((m) => (m[1] === 'steady' ? 'steady' : m[1]!.endsWith('up') ? 'spinup' : 'spindown'));
      // judged by the first model the sentence names ("spin-up could not be fitted…; use the steady model")
      const aboutOther = named.length > 0 && named[0] !== fit.model;
      notes.push({ label: aboutOther ? 'fit (model not chosen)' : 'fit', words: w, serious: !aboutOther });
    }
    for (const w of fit.selection?.notes ?? []) notes.push({ label: 'fit (model not chosen)', words: w, serious: false });
  }
  const seen = new Set(notes.map((n) => n.words));
  for (const w of record.warnings) if (!seen.has(w)) notes.push({ label: 'batch', words: w, serious: true });
  return notes;
}
