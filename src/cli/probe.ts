import type { Command } from 'commander';
import { probeVideo } from '../video/probeVideo.js';
import type { VideoProbe } from '../video/probeVideo.js';
import { globalOptions } from './globalOptions.js';

/** Times listed in the human-readable output before "and N more". */
const LISTED_TIMES = 10;

/** Rounds a time to the microsecond for printing (timestamps are no finer than that). */
function us(t: number): number {
  return Math.round(t * 1e6) / 1e6;
}

/** The JSON object `revtrace probe --json` prints (frame times only with --frame-times). */
export function probeJson(file: string, p: VideoProbe, withTimes: boolean): Record<string, unknown> {
  return {
    file,
    container: p.container,
    codec: p.codec,
    width: p.width,
    height: p.height,
    coded_width: p.coded_width,
    coded_height: p.coded_height,
    rotation_deg: p.rotation_deg,
    frame_count: p.frame_count,
    duration_s: us(p.duration_s),
    start_s: us(p.start_s),
    nominal_fps: Math.round(p.nominal_fps * 1000) / 1000,
    declared_fps: Number.isFinite(p.declared_fps) ? Math.round(p.declared_fps * 1000) / 1000 : null,
    variable_frame_rate: p.variable_frame_rate,
    interval_s: { min: us(p.interval_s.min), median: us(p.interval_s.median), max: us(p.interval_s.max), mean: us(p.interval_s.mean) },
    dropped: { count: p.dropped.count, at_s: p.dropped.at_s.map(us) },
    duplicated: { count: p.duplicated.count, at_s: p.duplicated.at_s.map(us) },
    ...(withTimes && p.frame_times_s ? { frame_times_s: Array.from(p.frame_times_s, us) } : {}),
  };
}

function listTimes(at_s: number[]): string {
  const shown = at_s.slice(0, LISTED_TIMES).map((t) => `${us(t).toFixed(3)} s`).join(', ');
  return at_s.length > LISTED_TIMES ? `${shown} and ${at_s.length - LISTED_TIMES} more` : shown;
}

/** Human-readable probe report, one fact per line. */
export function probeText(file: string, p: VideoProbe): string {
  const ms = (t: number): string => `${(t * 1000).toFixed(3)} ms`;
  const lines = [
    `file            ${file}`,
    `container       ${p.container}`,
    `codec           ${p.codec}`,
    `size            ${p.width}×${p.height} px as displayed${p.rotation_deg !== 0 ? ` (stored ${p.coded_width}×${p.coded_height}, display rotation ${p.rotation_deg}° counterclockwise)` : ''}`,
    `frames          ${p.frame_count}`,
    `duration        ${us(p.duration_s).toFixed(3)} s`,
    `frame rate      ${p.nominal_fps.toFixed(3)} fps nominal (1 / median interval)${Number.isFinite(p.declared_fps) ? `, ${p.declared_fps.toFixed(3)} fps declared` : ''}`,
    `interval        min ${ms(p.interval_s.min)}, median ${ms(p.interval_s.median)}, max ${ms(p.interval_s.max)}`,
    `variable rate   ${p.variable_frame_rate ? 'yes: frame times are not on a constant grid; revtrace uses each frame\'s own time' : 'no'}`,
    `dropped         ${p.dropped.count}${p.dropped.count > 0 ? ` (gaps after ${listTimes(p.dropped.at_s)})` : ''}`,
    `duplicated      ${p.duplicated.count}${p.duplicated.count > 0 ? ` (at ${listTimes(p.duplicated.at_s)})` : ''}`,
  ];
  return `${lines.join('\n')}\n`;
}

/** Every frame's presentation time as a `frame,t_s` table after a blank line (text output with --frame-times). */
export function frameTimesText(p: VideoProbe): string {
  const times = p.frame_times_s ? Array.from(p.frame_times_s, (t, i) => `${i},${us(t).toFixed(6)}`) : [];
  return `\nframe,t_s\n${times.join('\n')}${times.length > 0 ? '\n' : ''}`;
}

/** `revtrace probe <video>`: what the file holds and how regular its frame timing is. */
export function registerProbe(program: Command): void {
  program
    .command('probe')
    .description('describe a video: container, codec, displayed size, frame count, duration and frame timing (variable rate, dropped and duplicated frames)')
    .argument('<video>', 'video file')
    .option('--json', 'print one JSON object instead of text')
    .option('--frame-times', 'also list every frame\'s presentation time (with --json: frame_times_s; as text: a frame,t_s table)')
    .action(async (video: string, o: { json?: boolean; frameTimes?: boolean }, command: Command) => {
      const g = globalOptions(command);
      const probe = await probeVideo(video, { ffprobe: g.ffprobe });
      if (o.json) process.stdout.write(`${JSON.stringify(probeJson(video, probe, Boolean(o.frameTimes)))}\n`);
      else process.stdout.write(probeText(video, probe) + (o.frameTimes ? frameTimesText(probe) : ''));
    });
}
