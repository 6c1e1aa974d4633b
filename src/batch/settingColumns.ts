import type { RegionPx, RunSettings } from './RunSettings.js';

/** Parsing one cell: the value, or a sentence saying what is wrong and what to write instead. */
export type CellResult<T> = { ok: true; value: T } | { ok: false; problem: string };

/** A manifest column (or defaults key) that overrides one track or fit setting. */
export interface SettingColumn {
  /** Parses a trimmed, non-empty cell. */
  parse(text: string): CellResult<unknown>;
  /** Puts a parsed value into the settings. */
  apply(settings: RunSettings, value: unknown): void;
}

/** A plain decimal number (optional sign and exponent) as written in a cell, or NaN for anything else. */
export function parseDecimal(text: string): number {
  return /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(text) ? Number(text) : NaN;
}

/** Splits "a,b,c" (or ';' or spaces) into numbers; null when any part is not a finite number. */
function numbers(text: string): number[] | null {
  const values = text.split(/[\s,;]+/).filter((s) => s !== '').map(parseDecimal);
  return values.every(Number.isFinite) ? values : null;
}

function region(name: string): (text: string) => CellResult<RegionPx> {
  return (text) => {
    const v = numbers(text);
    if (!v || v.length !== 4 || !v.every(Number.isInteger) || v[0]! < 0 || v[1]! < 0 || v[2]! <= 0 || v[3]! <= 0) {
      return { ok: false, problem: `${name} "${text}" is not a region; write x,y,w,h in whole pixels (x, y ≥ 0; w, h > 0), e.g. "120,40,400,400"` };
    }
    return { ok: true, value: { x: v[0]!, y: v[1]!, w: v[2]!, h: v[3]! } };
  };
}

function seconds(name: string): (text: string) => CellResult<number> {
  return (text) => {
    const v = numbers(text);
    if (!v || v.length !== 1 || v[0]! < 0) return { ok: false, problem: `${name} "${text}" is not a time; write seconds from the start of the clip, e.g. 2.5` };
    return { ok: true, value: v[0]! };
  };
}

const MARKER = /^(bright|dark|texture|colou?r:#[0-9a-fA-F]{6})$/;
const MODELS = ['steady', 'spinup', 'spindown', 'auto'] as const;

/** The override columns, by name as written in the manifest header or defaults file. */
export const SETTING_COLUMNS: Record<string, SettingColumn> = {
  roi: { parse: region('roi'), apply: (s, v) => { s.track.roi = v as RegionPx; } },
  anchor: { parse: region('anchor'), apply: (s, v) => { s.track.anchor = v as RegionPx; } },
  center: {
    parse: (text) => {
      const v = numbers(text);
      if (!v || v.length !== 2 || v[0]! < 0 || v[1]! < 0) return { ok: false, problem: `center "${text}" is not a point; write x,y in pixels of the displayed frame, e.g. "640,360"` };
      return { ok: true, value: { x_px: v[0]!, y_px: v[1]! } };
    },
    apply: (s, v) => { s.track.centre = v as { x_px: number; y_px: number }; },
  },
  marker: {
    parse: (text) => {
      const t = text.toLowerCase().replace(/^colour:/, 'color:');
      if (!MARKER.test(t)) return { ok: false, problem: `marker "${text}" is unknown; write bright, dark, texture or color:#rrggbb` };
      return { ok: true, value: t };
    },
    apply: (s, v) => { s.track.marker = v as string; },
  },
  from: { parse: seconds('from'), apply: (s, v) => { s.track.from_s = v as number; } },
  to: { parse: seconds('to'), apply: (s, v) => { s.track.to_s = v as number; } },
  tilt: {
    parse: (text) => {
      const v = numbers(text);
      if (!v || v.length !== 1 || v[0]! < 0 || v[0]! >= 90) return { ok: false, problem: `tilt "${text}" is not a camera tilt; write degrees from 0 (square-on) to below 90` };
      return { ok: true, value: v[0]! };
    },
    apply: (s, v) => { s.track.tilt_deg = v as number; },
  },
  markers: {
    parse: (text) => {
      const v = numbers(text);
      if (!v || v.length !== 1 || !Number.isInteger(v[0]!) || v[0]! < 1 || v[0]! > 8) return { ok: false, problem: `markers "${text}" is not a number of marker spots; write a whole number from 1 to 8` };
      return { ok: true, value: v[0]! };
    },
    apply: (s, v) => { s.track.markers = v as number; },
  },
  model: {
    parse: (text) => {
      const t = text.toLowerCase();
      if (!(MODELS as readonly string[]).includes(t)) return { ok: false, problem: `model "${text}" is unknown; write steady, spinup, spindown or auto` };
      return { ok: true, value: t };
    },
    apply: (s, v) => { s.fit.model = v as RunSettings['fit']['model']; },
  },
  margin: {
    parse: (text) => {
      const v = numbers(text);
      if (!v || v.length !== 1 || v[0]! <= 0) return { ok: false, problem: `margin "${text}" is not a rate; write a positive number of deg/s, e.g. 0.5` };
      return { ok: true, value: v[0]! };
    },
    apply: (s, v) => { s.fit.margin_deg_s = v as number; },
  },
  level: {
    parse: (text) => {
      const v = numbers(text);
      if (!v || v.length !== 1 || v[0]! <= 0.5 || v[0]! >= 1) return { ok: false, problem: `level "${text}" is not a confidence level; write a number between 0.5 and 1, e.g. 0.95` };
      return { ok: true, value: v[0]! };
    },
    apply: (s, v) => { s.fit.level = v as number; },
  },
};

/** Column names accepted as another spelling of a setting column. */
export const COLUMN_ALIASES: Record<string, string> = { centre: 'center' };

/** Checks a run's settings as a whole (e.g. from before to); a sentence per problem, naming the column. */
export function crossSettingProblems(s: RunSettings): { column: string; message: string }[] {
  const out: { column: string; message: string }[] = [];
  if (s.track.from_s !== null && s.track.to_s !== null && s.track.to_s <= s.track.from_s) {
    out.push({ column: 'to', message: `to (${s.track.to_s} s) is not after from (${s.track.from_s} s); give a window that ends after it starts` });
  }
  return out;
}
