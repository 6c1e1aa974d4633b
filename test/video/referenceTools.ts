// ffmpeg and ffprobe from the installer packages, used directly as references and to make fixtures.
import { execFileSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const require = createRequire(import.meta.url);
export const FFMPEG: string = (require('@ffmpeg-installer/ffmpeg') as { path: string }).path;
export const FFPROBE: string = (require('@ffprobe-installer/ffprobe') as { path: string }).path;

/** A fresh temporary folder for one test file. */
export function tempDir(prefix: string): string {
  return mkdtempSync(join(tmpdir(), `revtrace-${prefix}-`));
}

/** Runs ffmpeg with the given arguments (quiet, overwrite) and returns stdout. */
export function ffmpeg(args: string[]): Buffer {
  return execFileSync(FFMPEG, ['-hide_banner', '-loglevel', 'error', '-nostdin', '-y', ...args], { maxBuffer: 1 << 30 });
}

/**
 * Presentation times of every presented video packet, seconds, as ffprobe prints them (packet
 * pts_time), sorted ascending: the reference for frame times. Packets ffprobe flags D (discarded by
 * the file's edit list, so never shown by a player) are left out.
 */
export function ffprobePacketTimes(file: string): number[] {
  const out = execFileSync(FFPROBE, ['-v', 'error', '-select_streams', 'v:0', '-show_entries', 'packet=pts_time,flags', '-of', 'csv=p=0', file]).toString();
  return out.split('\n').map((l) => l.trim().split(',')).filter(([t, flags]) => t !== undefined && t !== '' && !(flags ?? '').includes('D'))
    .map(([t]) => Number(t)).sort((a, b) => a - b);
}

/** A testsrc2 clip (ffmpeg's own test pattern) in H.264/MP4, constant rate. */
export function testsrc2Clip(file: string, o: { size: string; rate: number; seconds: number; extra?: string[] }): string {
  ffmpeg(['-f', 'lavfi', '-i', `testsrc2=size=${o.size}:rate=${o.rate}`, '-t', String(o.seconds), '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', ...(o.extra ?? []), file]);
  return file;
}
