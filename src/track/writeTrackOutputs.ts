import { join } from 'node:path';
import { PNG } from 'pngjs';
import { writeFileAtomic } from '../writeFileAtomic.js';
import type { AngleSeries } from './AngleSeries.js';
import type { TrackResult } from './trackVideo.js';
import type { PreviewImage } from './drawPreview.js';

/** Column names of angle.csv, in order. */
export const ANGLE_CSV_COLUMNS = ['frame', 't_s', 'x_px', 'y_px', 'angle_deg', 'quality', 'flag'] as const;

/**
 * angle.csv text: a header row, then one row per decoded frame. A lost frame has empty x_px, y_px and
 * angle_deg and its reason in flag. Times to 1 µs, positions to 0.001 px, angles to 1e-5 deg.
 */
export function formatAngleCsv(s: AngleSeries): string {
  const num = (v: number, digits: number): string => (Number.isFinite(v) ? v.toFixed(digits) : '');
  const lines: string[] = [ANGLE_CSV_COLUMNS.join(',')];
  for (let i = 0; i < s.t_s.length; i++) {
    const flag = /[",\n]/.test(s.flag[i]) ? `"${s.flag[i].replace(/"/g, '""')}"` : s.flag[i];
    lines.push(`${s.frame[i]},${num(s.t_s[i], 6)},${num(s.x_px[i], 3)},${num(s.y_px[i], 3)},${num(s.angle_deg[i], 5)},${num(s.quality[i], 3)},${flag}`);
  }
  return `${lines.join('\n')}\n`;
}

/** Writes angle.csv, track.json and preview.png into `dir`, each atomically (temporary file, then rename). */
export async function writeTrackOutputs(dir: string, result: TrackResult): Promise<void> {
  const json = JSON.stringify(result.summary, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2);
  await writeFileAtomic(join(dir, 'angle.csv'), formatAngleCsv(result.series));
  await writeFileAtomic(join(dir, 'track.json'), `${json}\n`);
  await writeFileAtomic(join(dir, 'preview.png'), encodePreviewPng(result.preview));
}

/** The preview as PNG bytes: the RGB pixels go in as they are (no alpha) with one fixed filter (Paeth); pngjs's defaults (RGBA, all five filters tried per row) take ≈ 3× as long. */
function encodePreviewPng(preview: PreviewImage): Buffer {
  const { width, height, rgb } = preview;
  const data = Buffer.from(rgb.buffer, rgb.byteOffset, rgb.byteLength);
  return PNG.sync.write({ width, height, data } as PNG, { colorType: 2, inputColorType: 2, inputHasAlpha: false, filterType: 4 });
}
