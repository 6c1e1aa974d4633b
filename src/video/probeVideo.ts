import { open, stat } from 'node:fs/promises';
import { InputError } from '../errors.js';
import { FfmpegError } from './FfmpegError.js';
import { frameTiming } from './frameTiming.js';
import type { FrameTiming } from './frameTiming.js';
import { locateTool } from './locateTools.js';
import { lastStderrLine, runToolToEnd } from './runTool.js';

/** What a video file holds, from its container headers (no frame times). */
export interface VideoHeader {
  /** Container as ffprobe names it (e.g. "mov,mp4,m4a,3gp,3g2,mj2"). */
  container: string;
  /** Video codec as ffprobe names it (e.g. "h264"). */
  codec: string;
  /** Frame size in the displayed orientation (rotation applied), pixels. */
  width: number;
  height: number;
  /** Size as stored, before the display rotation. */
  coded_width: number;
  coded_height: number;
  /** Display rotation from the display matrix, degrees counterclockwise (ffprobe's convention): 0, 90, 180 or 270 (-90 is reported as 270). */
  rotation_deg: number;
  /** Frame rate the container declares (average), frames per second; NaN when it declares none. */
  declared_fps: number;
  /** Time of the stream start, seconds (frame times below are on the same clock). */
  start_s: number;
  /** Duration the container declares, seconds (NaN when it declares none). */
  duration_s: number;
  /** Time step of the stream's timestamps, seconds (e.g. 1/90000). */
  tick_s: number;
  /** Index of the video stream read. */
  stream_index: number;
  /** Frames the container's index lists for the stream (MP4/MOV sample table), or null when it does not say. */
  declared_frame_count: number | null;
}

/** Everything `revtrace probe` reports: header plus timing from the real per-frame presentation times. */
export interface VideoProbe extends VideoHeader, FrameTiming {
  /** Number of frames (video packets presented; packets an edit list discards are not counted). */
  frame_count: number;
  /** Frame rate a camera would call nominal: 1 / median frame interval, frames per second. */
  nominal_fps: number;
  /** Every frame's presentation time, seconds, ascending (omitted from the CLI's JSON unless asked). */
  frame_times_s?: Float64Array;
}

/** Which ffprobe to use. */
export interface ProbeVideoOptions {
  /** ffprobe executable (default: located by locateTools). */
  ffprobe?: string;
}

interface ProbeJson {
  streams?: Array<Record<string, unknown> & { side_data_list?: Array<Record<string, unknown>>; tags?: Record<string, string> }>;
  format?: Record<string, unknown>;
}

/** Checks that a path names a non-empty regular file; InputError with one sentence otherwise. */
export async function checkVideoPath(path: string): Promise<void> {
  let s;
  try {
    s = await stat(path);
  } catch {
    throw new InputError(`No file at ${path}; check the path.`);
  }
  if (s.isDirectory()) throw new InputError(`${path} is a folder, not a video file; give the path of one video.`);
  if (!s.isFile()) throw new InputError(`${path} is not a regular file; give the path of a video file.`);
  if (s.size === 0) throw new InputError(`${path} is empty (0 bytes); it is not a video.`);
}

function rational(text: unknown): number {
  if (typeof text !== 'string') return NaN;
  const [a, b] = text.split('/').map(Number);
  if (b === undefined) return Number.isFinite(a) ? a! : NaN;
  return a !== undefined && b !== 0 && Number.isFinite(a) && Number.isFinite(b) ? a / b : NaN;
}

/** Runs ffprobe, turning a file it cannot read into an InputError naming the reason ffprobe gives. */
async function ffprobe(tool: string, path: string, args: string[]): Promise<string> {
  try {
    return (await runToolToEnd(tool, ['-v', 'error', ...args, '-i', path], { tool: 'ffprobe', file: path })).toString('utf8');
  } catch (err) {
    if (err instanceof FfmpegError && err.toolExitCode !== null && err.toolExitCode !== 0) {
      if (/moov atom not found/i.test(err.stderrTail) && await startsLikeMp4(path)) {
        throw new InputError(`${path} has no MP4 index (moov box), so it was probably cut short while being written or copied; copy or export the video again.`, { cause: err });
      }
      const why = lastStderrLine(err.stderrTail).replace(/^.*?:\s*(?=[A-Z])/, '');
      throw new InputError(`${path} is not a video ffprobe can read (${why || 'no reason given'}); check that it is a complete video file.`, { cause: err });
    }
    throw err;
  }
}

/** True when the file begins with an ISO base media box (ftyp, mdat, free, skip, wide or moov), as MP4/MOV files do. */
async function startsLikeMp4(path: string): Promise<boolean> {
  const handle = await open(path, 'r');
  try {
    const head = Buffer.alloc(8);
    const { bytesRead } = await handle.read(head, 0, 8, 0);
    return bytesRead === 8 && ['ftyp', 'mdat', 'free', 'skip', 'wide', 'moov'].includes(head.toString('latin1', 4, 8));
  } finally {
    await handle.close();
  }
}

/** Reads the container and first video stream headers (fast: no frame data is read). */
export async function probeVideoHeader(path: string, options: ProbeVideoOptions = {}): Promise<VideoHeader> {
  await checkVideoPath(path);
  const tool = await locateTool('ffprobe', { ffprobe: options.ffprobe });
  const json = JSON.parse(await ffprobe(tool.path, path, ['-print_format', 'json', '-show_format', '-show_streams'])) as ProbeJson;
  const streams = json.streams ?? [];
  const video = streams.find((s) => s.codec_type === 'video' && !(s.disposition as Record<string, number> | undefined)?.attached_pic);
  if (!video) {
    const kinds = [...new Set(streams.map((s) => String(s.codec_type)))];
    throw new InputError(`${path} has no video stream${kinds.length > 0 ? ` (only ${kinds.join(', ')})` : ''}; give a video file.`);
  }
  const format_name = String(json.format?.format_name ?? '');
  if (/(^|,)image2$|_pipe$/.test(format_name)) {
    throw new InputError(`${path} is a single ${String(video.codec_name ?? 'image').toUpperCase()} image, not a video; give the video file of the run.`);
  }
  const coded_width = Number(video.width);
  const coded_height = Number(video.height);
  if (!(coded_width > 0 && coded_height > 0)) throw new InputError(`${path} has a video stream without a frame size; it may be damaged.`);
  let rotation = NaN;
  for (const sd of video.side_data_list ?? []) if (typeof sd.rotation === 'number') rotation = sd.rotation;
  if (Number.isNaN(rotation) && video.tags?.rotate !== undefined) rotation = -Number(video.tags.rotate); // tag: clockwise
  if (!Number.isFinite(rotation)) rotation = 0;
  const rotation_deg = ((Math.round(rotation / 90) * 90) % 360 + 360) % 360;
  const quarter = rotation_deg === 90 || rotation_deg === 270;
  const format = json.format ?? {};
  const duration = Number(video.duration ?? format.duration);
  const start = Number(video.start_time ?? format.start_time);
  return {
    container: String(format.format_name ?? 'unknown'),
    codec: String(video.codec_name ?? 'unknown'),
    width: quarter ? coded_height : coded_width,
    height: quarter ? coded_width : coded_height,
    coded_width,
    coded_height,
    rotation_deg,
    declared_fps: rational(video.avg_frame_rate) || rational(video.r_frame_rate),
    start_s: Number.isFinite(start) ? start : 0,
    duration_s: Number.isFinite(duration) ? duration : NaN,
    tick_s: rational(video.time_base) || 1e-6,
    stream_index: Number(video.index),
    declared_frame_count: Number(video.nb_frames) > 0 ? Number(video.nb_frames) : null,
  };
}

/** Frames the index may list beyond those stored without the file being cut short (packets an edit list drops are still stored). */
const CUT_SHORT_SLACK = 3;

/** InputError when a file holds clearly fewer frames than its index lists: an interrupted copy or recording. */
export function checkNotCutShort(path: string, frames_found: number, declared_frame_count: number | null): void {
  if (declared_frame_count !== null && frames_found < declared_frame_count - CUT_SHORT_SLACK) throw cutShortError(path, frames_found, declared_frame_count);
}

/** The sentence for a file whose data ends before its index says (ffmpeg's "partial file"), with the counts when known. */
export function cutShortError(path: string, frames_found: number, declared_frame_count: number | null): InputError {
  const counts = declared_frame_count !== null && frames_found < declared_frame_count ? `its index lists ${declared_frame_count} frames but only ${frames_found} can be read` : 'its data ends before its index says';
  return new InputError(`${path} is cut short: ${counts} (an interrupted copy or recording); copy or export it again.`);
}

/**
 * Presentation time of every frame of the video stream, seconds, ascending: the pts of each packet
 * (ffprobe -show_entries packet=pts; demuxing only, no decoding), sorted because packets come in
 * decoding order; packets an edit list discards are left out. Falls back to decoding
 * (best-effort frame timestamps) when the container stores no pts.
 */
export async function probeFrameTimes(path: string, header: VideoHeader, options: ProbeVideoOptions = {}): Promise<Float64Array> {
  const tool = await locateTool('ffprobe', { ffprobe: options.ffprobe });
  const select = ['-select_streams', String(header.stream_index)];
  const text = await ffprobe(tool.path, path, [...select, '-show_entries', 'packet=pts,flags', '-of', 'csv=p=0']);
  const ticks: number[] = [];
  let missing = false;
  let packets = 0;
  for (const line of text.split('\n')) {
    if (line.trim() === '') continue;
    packets++;
    const [pts, flags = ''] = line.split(',');
    if (flags.includes('D')) continue;
    const v = Number(pts);
    if (pts === 'N/A' || !Number.isFinite(v)) { missing = true; break; }
    ticks.push(v);
  }
  checkNotCutShort(path, packets, header.declared_frame_count);
  if (missing) {
    const decoded = await ffprobe(tool.path, path, [...select, '-show_entries', 'frame=best_effort_timestamp_time', '-of', 'csv=p=0']);
    const times = decoded.split('\n').map((l) => l.split(',')[0]!.trim()).filter((l) => l !== '' && l !== 'N/A').map(Number);
    return Float64Array.from(times).sort();
  }
  const sorted = Float64Array.from(ticks).sort();
  return sorted.map((t) => t * header.tick_s);
}

/**
 * Describes a video: container, codec, displayed size (rotation honoured), frame count, duration,
 * and frame-interval statistics from the real per-frame presentation times (variable frame rate,
 * dropped and duplicated frames). Bad files give an InputError with one sentence.
 */
export async function probeVideo(path: string, options: ProbeVideoOptions = {}): Promise<VideoProbe> {
  const header = await probeVideoHeader(path, options);
  const times = await probeFrameTimes(path, header, options);
  if (times.length === 0) throw new InputError(`${path} has a video stream with no frames; it may be truncated.`);
  const timing = frameTiming(times, { tick_s: header.tick_s });
  const duration_s = Number.isFinite(header.duration_s) ? header.duration_s
    : times.length > 1 ? times[times.length - 1]! - times[0]! + timing.interval_s.median : NaN;
  return {
    ...header,
    ...timing,
    duration_s,
    frame_count: times.length,
    nominal_fps: timing.median_fps,
    frame_times_s: times,
  };
}
