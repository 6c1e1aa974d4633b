import { InputError } from '../errors.js';
import { FfmpegError } from './FfmpegError.js';
import type { Frame } from './Frame.js';
import { locateFfmpeg } from './locateTools.js';
import { cutShortError, probeVideoHeader } from './probeVideo.js';
import type { VideoHeader } from './probeVideo.js';
import { runTool } from './runTool.js';

/** A rectangle in full-frame displayed pixels (rotation applied): left, top, width, height. */
export interface RoiPx {
  x: number;
  y: number;
  w: number;
  h: number;
}

/** What readFrames decodes and how. */
export interface ReadFramesOptions {
  /** ffmpeg executable (default: located by locateTools). */
  ffmpeg?: string;
  /** ffprobe executable, used for the frame size (default: located by locateTools). */
  ffprobe?: string;
  /** 'gray' (luma, full range 0–255; default) or 'rgb' (3 bytes per pixel). */
  pixels?: 'gray' | 'rgb';
  /** Crop, applied inside ffmpeg after the display rotation; frames come back at the ROI size. Default: whole frame. */
  roi?: RoiPx;
  /** First frame time to return, seconds (fast seek to the keyframe before, then exact). Default: start. */
  from_s?: number;
  /** Frames at or after this time are not returned, seconds. Default: to the end. */
  to_s?: number;
  /** Stops decoding: the iteration throws the signal's reason and ffmpeg is killed. */
  signal?: AbortSignal;
  /** Header already read with probeVideoHeader (saves one ffprobe run). */
  header?: VideoHeader;
  /**
   * Two pixel buffers take turns instead of a new one per frame (default false): a frame's `data` is then
   * overwritten once the frame after the next is being filled, so keep no frame beyond the next step of the
   * loop. For consumers that reduce each frame to numbers; it spares the garbage collector a frame's worth of memory per frame.
   */
  reuse_buffers?: boolean;
}

/** ffmpeg's word for a file whose data ends before its index (MP4) says it should. */
const PARTIAL_FILE = /partial file/;

/**
 * Matches the per-frame line of `setpts=print(PTS)`: the frame's timestamp printed by ffmpeg's expression
 * evaluator ("%f", e.g. "480000.000000", "nan" without one), after any "[name @ 0x…] " prefixes a build adds.
 */
const PTS_LINE = /^(?:\[[^\]]*\] )*(-?\d+\.\d+|-?nan|-?inf)$/i;
/** Timestamps pass through the filter graph in microseconds (settb=AVTB), so t_s is exact to 1 µs. */
const TICKS_PER_S = 1_000_000;

/** Checks an ROI against the displayed frame size; InputError naming the problem otherwise. */
export function checkRoi(roi: RoiPx, width: number, height: number, file: string): void {
  const { x, y, w, h } = roi;
  if (![x, y, w, h].every(Number.isInteger) || w < 1 || h < 1 || x < 0 || y < 0 || x + w > width || y + h > height) {
    throw new InputError(`Region of interest ${x},${y},${w},${h} (x,y,w,h) does not lie inside the ${width}×${height} frame of ${file}; give whole pixels inside it.`);
  }
}

/** Frames ffmpeg may queue ahead of the reader: about 32 MB of them, between 2 and 16. */
function fifoQueueFrames(frameBytes: number): number {
  return Math.max(2, Math.min(16, Math.floor((32 * 1024 * 1024) / frameBytes)));
}

/**
 * Decodes a video to frames, one per decoded frame, each with its own presentation time.
 * One ffmpeg process decodes, rotates for display, crops to the ROI and converts to gray or RGB;
 * its stdout is read with backpressure (a slow consumer pauses ffmpeg, memory stays flat).
 * Per-frame times come from the filter graph itself (setpts prints each frame's timestamp on stderr, one
 * short line per frame where the showinfo filter wrote fifteen pieces), in the same process as the pixels,
 * so times and frames cannot drift apart, even after a seek or where an edit list hides frames (a
 * second ffprobe process listing packets would have to guess which frames ffmpeg outputs after a
 * seek). Frames pass through with `-vsync passthrough`, or
 * `-fps_mode passthrough` on newer ffmpeg: nothing duplicated or dropped. Timestamps are kept as
 * stored (-copyts): t_s is the presentation time ffprobe reports for the same frame.
 * Breaking out of the loop or aborting the signal kills ffmpeg; failures are FfmpegError with the stderr tail.
 */
export async function* readFrames(path: string, options: ReadFramesOptions = {}): AsyncGenerator<Frame, void, undefined> {
  const pixels = options.pixels ?? 'gray';
  if (pixels !== 'gray' && pixels !== 'rgb') throw new InputError(`pixels must be 'gray' or 'rgb', not '${String(pixels)}'.`);
  const from_s = options.from_s ?? -Infinity;
  const to_s = options.to_s ?? Infinity;
  if (Number.isNaN(from_s) || Number.isNaN(to_s) || to_s <= from_s) throw new InputError(`the time window from ${options.from_s ?? 'the start'} to ${options.to_s ?? 'the end'} s is empty; give a start (--from) before the end (--to)`);
  // Locating ffmpeg (cached after the first call) overlaps the header read; header errors still come first.
  const located = locateFfmpeg({ ffmpeg: options.ffmpeg });
  located.catch(() => undefined); // awaited below; this only keeps an early header error from leaving it unhandled
  const header = options.header ?? await probeVideoHeader(path, { ffprobe: options.ffprobe });
  const roi = options.roi ?? { x: 0, y: 0, w: header.width, h: header.height };
  if (options.roi) checkRoi(roi, header.width, header.height, path);
  const ffmpeg = await located;
  const channels = pixels === 'gray' ? 1 : 3;
  const frameBytes = roi.w * roi.h * channels;

  // The frames go to stdout; setpts leaves each timestamp as it is and prints it (one line per frame, written
  // before the frame reaches the output, so a frame's time is on stderr before its last bytes are on stdout).
  const chain = [
    ...(options.roi ? [`crop=${roi.w}:${roi.h}:${roi.x}:${roi.y}:exact=1`] : []),
    `format=${pixels === 'gray' ? 'gray' : 'rgb24'}`,
    'settb=AVTB',
    'setpts=print(PTS)',
  ];
  const graph = `[0:${header.stream_index}]${chain.join(',')}[frames]`;
  const seek_s = Number.isFinite(from_s) ? from_s - header.start_s - 0.002 : 0;
  const args = [
    '-hide_banner', '-nostats', '-nostdin', '-loglevel', 'repeat+info', '-copyts',
    ...(seek_s > 0 ? ['-ss', seek_s.toFixed(6)] : []),
    '-i', path,
    '-filter_complex', graph, '-map', '[frames]', '-an', '-sn', '-dn',
    ...ffmpeg.passthroughArgs,
    // The fifo pseudo-muxer writes the pipe from its own thread with a queue of a few frames, so
    // decoding goes on while Node is busy instead of stalling on every full pipe (see bench/reader.mjs).
    '-c:v', 'rawvideo', '-pix_fmt', pixels === 'gray' ? 'gray' : 'rgb24',
    '-f', 'fifo', '-fifo_format', 'rawvideo', '-queue_size', String(fifoQueueFrames(frameBytes)), 'pipe:1',
  ];

  const times: number[] = []; // printed times not yet paired with a frame (a handful at most)
  let timesEnded = false;
  let wake: (() => void) | undefined;
  /** ffmpeg said the file's data ends before its index does ("partial file"), even when it decoded what was there without an error. */
  let partialFile = false;
  const onStderrLine = (line: string): boolean => {
    const m = PTS_LINE.exec(line);
    if (m) {
      times.push(Number(m[1]) / TICKS_PER_S); // "nan" (no timestamp) → NaN
      wake?.();
      return true;
    }
    if (PARTIAL_FILE.test(line)) partialFile = true;
    return false;
  };
  const onStderrEnd = (): void => { timesEnded = true; wake?.(); };
  const nextTime = async (): Promise<number | undefined> => {
    while (times.length === 0 && !timesEnded) await new Promise<void>((resolve) => { wake = resolve; });
    wake = undefined;
    return times.shift();
  };

  let index = 0;
  let decoded = 0;
  // Every byte is overwritten from the pipe, so the buffers skip zero-filling (a plain Uint8Array
  // view over an unpooled, uninitialised ArrayBuffer).
  const newFrame = (): Uint8Array => { const b = Buffer.allocUnsafeSlow(frameBytes); return new Uint8Array(b.buffer, b.byteOffset, frameBytes); };
  let frame = newFrame();
  let spare = options.reuse_buffers ? newFrame() : null;
  let filled = 0;
  const run = runTool(ffmpeg.path, args, { tool: 'ffmpeg', file: path, signal: options.signal, onStderrLine, onStderrEnd });
  try {
    for await (const chunk of run) {
      let at = 0;
      while (at < chunk.length) {
        const n = Math.min(frameBytes - filled, chunk.length - at);
        frame.set(chunk.subarray(at, at + n), filled);
        filled += n;
        at += n;
        if (filled < frameBytes) continue;
        // The time line arrives before the frame's last bytes: usually taken without an await.
        const t_s = times.length > 0 ? times.shift() : await nextTime();
        if (t_s === undefined && options.signal?.aborted) options.signal.throwIfAborted();
        if (t_s === undefined || Number.isNaN(t_s)) {
          throw new FfmpegError(`ffmpeg gave no presentation time for frame ${decoded} of ${path}; the file's timestamps may be damaged.`, { file: path, exitCode: null, stderrTail: '' });
        }
        decoded += 1;
        const data = frame;
        if (spare) {
          // the buffer yielded two frames ago is free again (its consumer has moved on)
          frame = spare;
          spare = data;
        } else frame = newFrame();
        filled = 0;
        if (t_s < from_s) continue;
        if (t_s >= to_s) return;
        yield { index, t_s, width: roi.w, height: roi.h, channels, data };
        index += 1;
      }
    }
    if (filled !== 0) {
      throw new FfmpegError(`ffmpeg stopped in the middle of frame ${decoded} of ${path}.`, { file: path, exitCode: 0, stderrTail: '' });
    }
    // a clip cut short with its index at the front decodes to the end of its data without an error: only this says so
    // (a clip trimmed without re-encoding lists the frames it drops too, but its data is whole)
    if (partialFile) throw cutShortError(path, decoded, header.declared_frame_count);
  } catch (err) {
    // ffmpeg stopping at a "partial file": say what happened to the file, not to ffmpeg
    if (err instanceof FfmpegError && (partialFile || PARTIAL_FILE.test(err.stderrTail))) throw cutShortError(path, decoded, header.declared_frame_count);
    throw err;
  } finally {
    await run.return(undefined);
  }
}
