// Tracking benchmark: `revtrace track` (the CLI command, in a child process) on a 1080p60 H.264 clip with a 480×480 region,
// beside bare ffmpeg decode + crop of the same file in the same script (wall-time ratio), and the peak
// memory of tracking a 1-minute and a 10-minute clip. Run after `npm run build`: node bench/track.mjs [--long]
// Clips come from ffmpeg's lavfi sources (a `geq` disc with a spot, turned by `rotate`, over a noisy
// background) and are cached under bench/out/ (git-ignored). Without --long only the 1-minute clip is used.
import { spawn, spawnSync } from 'node:child_process';
import { closeSync, existsSync, mkdirSync, openSync, renameSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import os from 'node:os';

const here = fileURLToPath(new URL('.', import.meta.url));
const out = join(here, 'out');
const ROI = { x: 720, y: 300, w: 480, h: 480 };

if (process.argv[2] === '--read') {
  // child: the reader alone (same crop, frames drained): what the transport into Node costs before any tracking
  const { readFrames } = await import('../dist/video/readFrames.js');
  for await (const frame of readFrames(process.argv[3], { roi: ROI, reuse_buffers: true })) void frame;
  process.exit(0);
}

if (process.argv[2] === '--run') {
  // child: `revtrace track` as a person runs it (the CLI's own imports included), then its wall time and peak RSS
  const { main } = await import('../dist/cli/main.js');
  const { readFileSync } = await import('node:fs');
  const t0 = performance.now();
  const code = await main(['node', 'revtrace', 'track', process.argv[3], '--roi', `${ROI.x},${ROI.y},${ROI.w},${ROI.h}`, '--out', process.argv[4], '--quiet']);
  if (code !== 0) process.exit(code);
  const s = JSON.parse(readFileSync(join(process.argv[4], 'track.json'), 'utf8'));
  console.log(JSON.stringify({
    wall_s: (performance.now() - t0) / 1000,
    maxRSS_MB: process.resourceUsage().maxRSS / 1024,
    frames: s.frames.decoded,
    lost: s.frames.lost,
    centre: [s.centre.x_px.value, s.centre.y_px.value],
  }));
  process.exit(0);
}

const { locateTools } = await import('../dist/index.js');
const ffmpeg = (await locateTools()).ffmpeg.path;
mkdirSync(out, { recursive: true });

function makeClip(file, args) {
  if (existsSync(file)) return file;
  const tmp = `${file}.part.mp4`;
  const t0 = performance.now();
  const r = spawnSync(ffmpeg, ['-hide_banner', '-loglevel', 'error', '-nostdin', '-y', ...args, tmp], { stdio: 'inherit' });
  if (r.status !== 0) throw new Error(`ffmpeg could not make ${file}`);
  renameSync(tmp, file);
  console.error(`made ${file} in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  return file;
}

// 10 s segment: exactly two turns (72°/s), so looped copies continue smoothly
const lum = "if(lt(hypot(X-240,Y-240),200),if(lt(hypot(X-390,Y-240),9),235,110),40)";
const seg = makeClip(join(out, 'track-1080p60-10s.mp4'), [
  '-f', 'lavfi', '-i', 'color=c=0x404040:s=1920x1080:r=60:d=10',
  '-f', 'lavfi', '-i', 'color=c=black:s=480x480:r=60:d=1',
  '-filter_complex',
  `[0:v]format=yuv420p,noise=alls=6:allf=t[bg];[1:v]format=gray,geq=lum='${lum}',trim=end_frame=1,loop=loop=599:size=1:start=0,setpts=N/60/TB,rotate=a=-2*PI*t/5:c=0x282828,format=yuv420p[disc];[bg][disc]overlay=${ROI.x}:${ROI.y}:shortest=1,format=yuv420p`,
  '-c:v', 'libx264', '-preset', 'veryfast', '-crf', '23', '-g', '60',
]);
const oneMin = makeClip(join(out, 'track-1080p60-1min.mp4'), ['-stream_loop', '5', '-i', seg, '-t', '60', '-c', 'copy']);
const long = process.argv.includes('--long');
const tenMin = long ? makeClip(join(out, 'track-1080p60-10min.mp4'), ['-stream_loop', '59', '-i', seg, '-t', '600', '-c', 'copy']) : null;

/** Bare ffmpeg: crop + gray to raw video, consumed and discarded; wall seconds. */
function bare(file) {
  return new Promise((resolve, reject) => {
    const sink = openSync('/dev/null', 'w');
    const t0 = performance.now();
    const child = spawn(ffmpeg, ['-hide_banner', '-loglevel', 'error', '-nostdin', '-i', file, '-vf', `crop=${ROI.w}:${ROI.h}:${ROI.x}:${ROI.y},format=gray`, '-f', 'rawvideo', '-'], { stdio: ['ignore', sink, 'inherit'] });
    child.on('close', (code) => {
      closeSync(sink);
      code === 0 ? resolve((performance.now() - t0) / 1000) : reject(new Error(`ffmpeg exited ${code}`));
    });
  });
}

/** `revtrace track` in a child node process (startup, imports, probe, decode, track, fit, hash, preview, writes); wall seconds + child's numbers. */
function track(file) {
  const dir = join(out, 'track-out');
  rmSync(dir, { recursive: true, force: true });
  const t0 = performance.now();
  const r = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--run', file, dir], { encoding: 'utf8' });
  const wall = (performance.now() - t0) / 1000;
  if (r.status !== 0) throw new Error(r.stderr);
  return { wall_s: wall, ...JSON.parse(r.stdout) };
}

/** The reader alone in a child node process; wall seconds. */
function readOnly(file) {
  const t0 = performance.now();
  const r = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--read', file], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(r.stderr);
  return (performance.now() - t0) / 1000;
}

const load = () => os.loadavg()[0].toFixed(1);
await bare(oneMin); // warm the page cache
const reps = Number(process.env.REPS ?? 3);
const bases = [];
const tracks = [];
const reads = [];
for (let i = 0; i < reps; i++) {
  bases.push(await bare(oneMin));
  reads.push(readOnly(oneMin));
  tracks.push(track(oneMin));
}
const best = (a) => Math.min(...a);
const bestTrack = best(tracks.map((t) => t.wall_s));
console.log(JSON.stringify({
  test: 'wall time, 1 min 1080p60 H.264, ROI 480x480',
  bare_ffmpeg_s: bases.map((v) => +v.toFixed(2)),
  track_s: tracks.map((t) => +t.wall_s.toFixed(2)),
  ratio_best: +(bestTrack / best(bases)).toFixed(3),
  ratio_median: +(median(tracks.map((t) => t.wall_s)) / median(bases)).toFixed(3),
  // the split of the overhead: the reader alone against bare ffmpeg, and tracking against the reader alone
  reader_s: reads.map((v) => +v.toFixed(2)),
  reader_ratio_median: +(median(reads) / median(bases)).toFixed(3),
  track_over_reader_median: +(median(tracks.map((t) => t.wall_s)) / median(reads)).toFixed(3),
  frames: tracks[0].frames,
  lost: tracks[0].lost,
  centre: tracks[0].centre.map((v) => +v.toFixed(2)),
  maxRSS_MB_1min: +Math.max(...tracks.map((t) => t.maxRSS_MB)).toFixed(1),
  load_1min: load(),
}));
if (tenMin) {
  const base10 = await bare(tenMin);
  const t10 = track(tenMin);
  console.log(JSON.stringify({ test: 'peak RSS, 10 min 1080p60', bare_ffmpeg_s: +base10.toFixed(1), track_s: +t10.wall_s.toFixed(1), ratio: +(t10.wall_s / base10).toFixed(3), maxRSS_MB: +t10.maxRSS_MB.toFixed(1), frames: t10.frames, lost: t10.lost, load_1min: load() }));
}

function median(a) {
  const s = [...a].sort((x, y) => x - y);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}
