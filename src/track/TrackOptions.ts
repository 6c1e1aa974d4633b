import { InputError } from '../errors.js';
import { checkOptionNames } from '../checkOptionNames.js';
import type { VideoHeader } from '../video/probeVideo.js';

/** A rectangle in full-frame pixels of the displayed video: x, y of the top-left corner, width, height. */
export interface RegionPx {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Options of trackVideo; every field has a default. */
export interface TrackOptions {
  /** Region the marker moves in (default: the whole frame). Only this (with the anchor) is decoded. */
  roi?: RegionPx | [number, number, number, number];
  /** Rotation centre, full-frame px (default: fitted from the marker path). Accepts {x, y} or {x_px, y_px}. */
  centre?: { x?: number; y?: number; x_px?: number; y_px?: number };
  /** 'bright' (default) | 'dark' | 'color:#rrggbb' | 'texture'. */
  marker?: string;
  /** How many marker spots the hub carries (bright, dark and colour markers; default 1). With more than one, all are followed and combined. */
  markers?: number;
  /** Colour marker: largest CIELAB difference (lightness half-weighted) still counted as the marker (default 40). */
  colour_tolerance?: number;
  /** A still part of the scene whose motion is taken off the marker (camera shake). */
  anchor?: RegionPx | [number, number, number, number];
  from_s?: number;
  to_s?: number;
  /** Camera tilt from square-on, deg: used when the run is too short to fit the ellipse (or to override it). */
  tilt_deg?: number;
  /** Direction of the tilt axis in the image (the ellipse's major axis), deg CCW from +x (default 0 = horizontal). */
  tilt_axis_deg?: number;
  /** Texture mode: inner and outer radius of the annulus read around the centre, px (default 10 and 0.9 × the distance to the region's edge). */
  texture_radii_px?: [number, number];
  ffmpeg?: string;
  ffprobe?: string;
  /** The video's header, already read with probeVideoHeader (saves one ffprobe run). */
  header?: VideoHeader;
  signal?: AbortSignal;
  onProgress?: (p: { frames: number; t_s: number; duration_s: number }) => void;
}

/** Every option name trackVideo reads (a misspelt one would otherwise be ignored without a word). */
const TRACK_OPTION_NAMES: readonly (keyof TrackOptions)[] = [
  'roi', 'centre', 'marker', 'markers', 'colour_tolerance', 'anchor', 'from_s', 'to_s', 'tilt_deg', 'tilt_axis_deg',
  'texture_radii_px', 'ffmpeg', 'ffprobe', 'header', 'signal', 'onProgress',
];
/** Spellings people reach for, and the option meant. */
const TRACK_OPTION_SPELLINGS: Record<string, keyof TrackOptions> = { center: 'centre', color_tolerance: 'colour_tolerance', tolerance: 'colour_tolerance', from: 'from_s', to: 'to_s', tilt: 'tilt_deg' };

/** Throws an InputError naming the first option trackVideo does not know (for callers from plain JavaScript, where types do not check it). */
export function checkTrackOptionNames(options: object): void {
  checkOptionNames('trackVideo', options, TRACK_OPTION_NAMES, TRACK_OPTION_SPELLINGS);
}

export type MarkerMode = { kind: 'bright' } | { kind: 'dark' } | { kind: 'color'; rgb: [number, number, number]; hex: string } | { kind: 'texture' };

/** Parses a marker option: 'bright', 'dark', 'color:#rrggbb' (or 'colour:'), 'texture'. */
export function parseMarker(marker: string): MarkerMode {
  const m = marker.trim().toLowerCase();
  if (m === 'bright' || m === 'dark' || m === 'texture') return { kind: m };
  const c = /^colou?r:#?([0-9a-f]{6})$/.exec(m);
  if (c) {
    const v = Number.parseInt(c[1], 16);
    return { kind: 'color', rgb: [(v >> 16) & 255, (v >> 8) & 255, v & 255], hex: `#${c[1]}` };
  }
  throw new InputError(`--marker ${marker} is not a marker kind; give bright, dark, color:#rrggbb or texture`);
}

/** A region option as {x, y, w, h} in whole pixels, or an InputError naming the option. */
export function toRegion(name: string, value: RegionPx | [number, number, number, number] | string): RegionPx {
  let r: RegionPx;
  if (typeof value === 'string') {
    const p = value.split(',').map((s) => Number(s.trim()));
    if (p.length !== 4) throw new InputError(`${name} ${value} must be four numbers x,y,w,h in pixels`);
    r = { x: p[0], y: p[1], w: p[2], h: p[3] };
  } else if (Array.isArray(value)) {
    r = { x: value[0], y: value[1], w: value[2], h: value[3] };
  } else {
    r = { x: value.x, y: value.y, w: value.w, h: value.h };
  }
  if (![r.x, r.y, r.w, r.h].every(Number.isInteger) || r.w < 8 || r.h < 8) {
    throw new InputError(`${name} ${r.x},${r.y},${r.w},${r.h} must be whole pixels x,y,w,h with w and h at least 8`);
  }
  return r;
}

/** Checks that a region lies inside the frame, naming the option when it does not. */
export function checkInside(name: string, r: RegionPx, width: number, height: number): void {
  if (r.x < 0 || r.y < 0 || r.x + r.w > width || r.y + r.h > height) {
    throw new InputError(`${name} ${r.x},${r.y},${r.w},${r.h} lies outside the ${width}×${height} frame; give x,y,w,h inside it`);
  }
}
