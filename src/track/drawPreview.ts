import type { VideoHeader } from '../video/probeVideo.js';
import { readFrames } from '../video/readFrames.js';
import type { RegionPx } from './TrackOptions.js';
import type { ViewGeometry } from './rotorPlaneAngle.js';

/** An RGB image, row-major, 3 bytes per pixel. */
export interface PreviewImage {
  width: number;
  height: number;
  rgb: Uint8Array;
}

export interface PreviewOptions {
  header: VideoHeader;
  ffmpeg?: string;
  ffprobe?: string;
  from_s?: number;
  roi: RegionPx;
  anchor: RegionPx | null;
  view: ViewGeometry | null;
  centre: { x_px: number; y_px: number };
  detections: { x_px: number; y_px: number }[];
  /** With several markers: a sample of detections of each further marker (the first marker's are `detections`). */
  other_markers?: { x_px: number; y_px: number }[][];
  signal?: AbortSignal;
}

const YELLOW: [number, number, number] = [255, 210, 0];
const CYAN: [number, number, number] = [0, 200, 255];
const GREEN: [number, number, number] = [60, 230, 60];
const RED: [number, number, number] = [255, 40, 40];
const MAGENTA: [number, number, number] = [255, 0, 200];

/** The first frame of the run (full frame, RGB, decoded on its own), or a black frame when none is decoded. */
export async function readPreviewFrame(path: string, o: Pick<PreviewOptions, 'header' | 'ffmpeg' | 'ffprobe' | 'from_s' | 'signal'>): Promise<PreviewImage> {
  for await (const frame of readFrames(path, { ffmpeg: o.ffmpeg, ffprobe: o.ffprobe, pixels: 'rgb', from_s: o.from_s, header: o.header, signal: o.signal })) {
    return { width: frame.width, height: frame.height, rgb: Uint8Array.from(frame.data) };
  }
  return { width: o.header.width, height: o.header.height, rgb: new Uint8Array(o.header.width * o.header.height * 3) };
}

/**
 * Draws the set-up marks onto an RGB image in place: the region (yellow), the anchor (cyan), the fitted marker
 * path (green), a sample of detections (magenta) and the centre (red cross).
 */
export function markPreview(img: PreviewImage, o: Pick<PreviewOptions, 'roi' | 'anchor' | 'view' | 'centre' | 'detections' | 'other_markers'>): void {
  rect(img, o.roi, YELLOW);
  if (o.anchor) rect(img, o.anchor, CYAN);
  for (const points of [o.detections, ...(o.other_markers ?? [])]) {
    if (o.view) drawPath(img, o.view, points);
    const every = Math.max(1, Math.floor(points.length / 24));
    for (let k = 0; k < points.length; k += every) dot(img, points[k].x_px, points[k].y_px, MAGENTA, 2);
  }
  for (let d = -8; d <= 8; d++) {
    dot(img, o.centre.x_px + d, o.centre.y_px, RED, 0);
    dot(img, o.centre.x_px, o.centre.y_px + d, RED, 0);
  }
}

/** One marker's fitted path (green): the view's ellipse, its size taken from the points' mean distance from the centre, px. */
function drawPath(img: PreviewImage, v: ViewGeometry, points: { x_px: number; y_px: number }[]): void {
  let r = 0;
  for (const d of points) r += Math.hypot(d.x_px - v.cx_px, d.y_px - v.cy_px);
  r = points.length ? r / points.length : 0;
  if (!(r > 0)) return;
  const phi = (v.major_axis_deg * Math.PI) / 180;
  const a = (2 * r) / (1 + v.axis_ratio);
  const b = a * v.axis_ratio;
  const steps = Math.ceil(2 * Math.PI * a);
  for (let k = 0; k < steps; k++) {
    const t = (2 * Math.PI * k) / steps;
    const u = a * Math.cos(t) * Math.cos(phi) - b * Math.sin(t) * Math.sin(phi);
    const w = a * Math.cos(t) * Math.sin(phi) + b * Math.sin(t) * Math.cos(phi);
    dot(img, v.cx_px + u, v.cy_px - w, GREEN, 0);
  }
}

function put(img: PreviewImage, x: number, y: number, c: [number, number, number]): void {
  if (x < 0 || y < 0 || x >= img.width || y >= img.height) return;
  const i = 3 * (y * img.width + x);
  img.rgb[i] = c[0];
  img.rgb[i + 1] = c[1];
  img.rgb[i + 2] = c[2];
}

function dot(img: PreviewImage, x: number, y: number, c: [number, number, number], radius: number): void {
  if (!Number.isFinite(x) || !Number.isFinite(y)) return;
  const X = Math.round(x);
  const Y = Math.round(y);
  for (let dy = -radius; dy <= radius; dy++) for (let dx = -radius; dx <= radius; dx++) if (dx * dx + dy * dy <= radius * radius) put(img, X + dx, Y + dy, c);
}

function rect(img: PreviewImage, r: RegionPx, c: [number, number, number]): void {
  for (let x = r.x; x < r.x + r.w; x++) {
    put(img, x, r.y, c);
    put(img, x, r.y + r.h - 1, c);
  }
  for (let y = r.y; y < r.y + r.h; y++) {
    put(img, r.x, y, c);
    put(img, r.x + r.w - 1, y, c);
  }
}
