import { rename, rm } from 'node:fs/promises';
import { basename, dirname, extname, join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { InputError } from '../errors.js';
import { makeFolders } from '../makeFolders.js';
import { locateFfmpeg } from './locateTools.js';
import { runToolToEnd } from './runTool.js';
import { rewriteMp4Timing } from './rewriteMp4Timing.js';

/** One frame to encode: its presentation time and its pixels (gray or RGB, row-major, no padding). */
export interface VideoFrameIn {
  /** Presentation time, seconds; strictly increasing along the clip, first ≥ 0. */
  t_s: number;
  data: Uint8Array;
}

/** How writeVideo encodes. */
export interface WriteVideoOptions {
  width: number;
  height: number;
  /** 1 = gray bytes, 3 = RGB bytes per pixel. */
  channels: 1 | 3;
  /** H.264 constant-rate-factor (0–51, lower is better; 18 is visually clean), or 'lossless' (exact bytes back). */
  quality: { crf: number } | 'lossless';
  /** ffmpeg executable (default: located by locateTools). */
  ffmpeg?: string;
  /** x264 speed preset (default 'veryfast'; 'lossless' always uses 'ultrafast'). */
  preset?: string;
  signal?: AbortSignal;
}

/** MP4 media timescale, ticks per second: every frame time is kept to ±1/180000 s. */
export const WRITE_TIMESCALE = 90_000;

/**
 * Encodes frames to an H.264 MP4 that keeps each frame's own presentation time (variable frame
 * rate and dropped frames survive). ffmpeg encodes the frames as a constant-rate stream without
 * B-frames; the sample-timing table is then replaced with the real times (see rewriteMp4Timing),
 * and the finished file is renamed into place, so a failed run leaves nothing behind.
 * Gray is stored as full-range luma (exact in 'lossless'); RGB 'lossless' uses H.264 in RGB (libx264rgb).
 */
export async function writeVideo(path: string, frames: Iterable<VideoFrameIn> | AsyncIterable<VideoFrameIn>, options: WriteVideoOptions): Promise<void> {
  const { width, height, channels, quality } = options;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 2 || height < 2) {
    throw new InputError(`Video size ${width}×${height} is not usable; give whole numbers of at least 2 pixels.`);
  }
  if (channels !== 1 && channels !== 3) throw new InputError(`channels must be 1 (gray) or 3 (RGB), not ${String(channels)}.`);
  if (quality !== 'lossless' && !(quality.crf >= 0 && quality.crf <= 51)) {
    throw new InputError(`crf ${quality.crf} is outside 0–51; choose for example 18.`);
  }
  const ext = extname(path).toLowerCase();
  if (!['.mp4', '.m4v', '.mov'].includes(ext)) throw new InputError(`the video ${basename(path)} would not be an MP4 file; give a name ending in .mp4`);
  const ffmpeg = await locateFfmpeg({ ffmpeg: options.ffmpeg });

  const frameBytes = width * height * channels;
  const times: number[] = [];
  const iterator = (Symbol.asyncIterator in frames ? frames[Symbol.asyncIterator]() : (frames as Iterable<VideoFrameIn>)[Symbol.iterator]()) as AsyncIterator<VideoFrameIn> | Iterator<VideoFrameIn>;
  const take = async (): Promise<VideoFrameIn | undefined> => {
    const r = await iterator.next();
    if (r.done) return undefined;
    const f = r.value;
    const i = times.length;
    if (!(f.data instanceof Uint8Array) || f.data.length !== frameBytes) {
      throw new InputError(`Frame ${i} has ${f.data?.length ?? 0} bytes; a ${width}×${height}×${channels} frame needs ${frameBytes}.`);
    }
    if (!Number.isFinite(f.t_s) || f.t_s < 0 || (i > 0 && f.t_s <= times[i - 1]!)) {
      throw new InputError(`Frame ${i} has time ${f.t_s} s; frame times must be finite, ≥ 0 and strictly increasing.`);
    }
    times.push(f.t_s);
    return f;
  };
  // The first two frames set the nominal rate the encoder sees (its rate control uses it).
  const first = await take();
  if (!first) throw new InputError('There are no frames to write; give at least one frame.');
  const second = await take();
  const step_s = second ? second.t_s - first.t_s : 1 / 30;
  const rateMilli = Math.max(1, Math.round(1000 / step_s));
  async function* bytes(): AsyncGenerator<Uint8Array> {
    yield first!.data;
    if (!second) return;
    yield second.data;
    for (let f = await take(); f; f = await take()) yield f.data;
  }

  const gray = channels === 1;
  const codecArgs = quality === 'lossless'
    ? (gray ? ['-c:v', 'libx264', '-qp', '0', '-preset', 'ultrafast', '-pix_fmt', 'gray', '-color_range', 'jpeg']
      : ['-c:v', 'libx264rgb', '-qp', '0', '-preset', 'ultrafast', '-pix_fmt', 'rgb24'])
    : ['-c:v', 'libx264', '-crf', String(quality.crf), '-preset', options.preset ?? 'veryfast',
      // gray goes to full-range luma (yuvj…) so 0 and 255 come back as 0 and 255, not 16 and 235
      '-pix_fmt', `${gray ? 'yuvj' : 'yuv'}${width % 2 === 0 && height % 2 === 0 ? '420p' : '444p'}`];
  await makeFolders(dirname(path));
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
  const args = [
    '-hide_banner', '-nostats', '-loglevel', 'error',
    '-f', 'rawvideo', '-pix_fmt', gray ? 'gray' : 'rgb24', '-s', `${width}x${height}`, '-framerate', `${rateMilli}/1000`, '-i', 'pipe:0',
    '-an', ...codecArgs, '-bf', '0', ...ffmpeg.passthroughArgs,
    '-video_track_timescale', String(WRITE_TIMESCALE), '-f', 'mp4', '-y', tmp,
  ];
  let done = false;
  try {
    await runToolToEnd(ffmpeg.path, args, { tool: 'ffmpeg', file: path, stdin: bytes(), signal: options.signal });
    const n = times.length;
    const lastDuration_s = n >= 2 ? times[n - 1]! - times[n - 2]! : step_s;
    await rewriteMp4Timing(tmp, times, lastDuration_s);
    await rename(tmp, path);
    done = true;
  } finally {
    if (!done) await rm(tmp, { force: true });
  }
}
