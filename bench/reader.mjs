// Reader benchmark: readFrames against bare ffmpeg on the same file, and the reader's peak memory
// over a 10-minute 1080p60 clip. Run after `npm run build`: node bench/reader.mjs
// Clips are generated with ffmpeg's lavfi sources and cached under bench/out/ (git-ignored).
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, openSync, closeSync, readFileSync, renameSync, rmSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import os from 'node:os';
import { locateTools, probeVideoHeader, readFrames } from '../dist/index.js';

const here = fileURLToPath(new URL('.', import.meta.url));
const out = join(here, 'out');
const ROI = { x: 720, y: 300, w: 480, h: 480 };

/** Runs ffmpeg to make a clip once (temp name, then rename). */
function makeClip(ffmpeg, file, args) {
  if (existsSync(file)) return file;
  const tmp = `${file}.part.mp4`;
  const t0 = performance.now();
  const r = spawnSync(ffmpeg, ['-hide_banner', '-loglevel', 'error', '-nostdin', '-y', ...args, tmp], { stdio: 'inherit' });
  if (r.status !== 0) { rmSync(tmp, { force: true }); throw new Error(`ffmpeg could not make ${file}`); }
  renameSync(tmp, file);
  console.error(`made ${file} in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  return file;
}

/** Bare ffmpeg: crop + gray to raw video, written to /dev/null; wall seconds. */
function bare(ffmpeg, file) {
  return new Promise((resolve, reject) => {
    const sink = openSync('/dev/null', 'w');
    const t0 = performance.now();
    const child = spawn(ffmpeg, ['-hide_banner', '-loglevel', 'error', '-nostdin', '-i', file, '-vf', `crop=${ROI.w}:${ROI.h}:${ROI.x}:${ROI.y},format=gray`, '-f', 'rawvideo', '-'], { stdio: ['ignore', sink, 'inherit'] });
    child.on('close', (code) => { closeSync(sink); code === 0 ? resolve((performance.now() - t0) / 1000) : reject(new Error(`ffmpeg exited ${code}`)); });
  });
}

/** Bare ffmpeg as above, but its stdout piped into this Node process, which drops the chunks: the
 *  floor for any reader that gets the pixels into Node (kernel pipe copy + Node's reads); wall seconds. */
function barePiped(ffmpeg, file) {
  return new Promise((resolve, reject) => {
    const t0 = performance.now();
    const child = spawn(ffmpeg, ['-hide_banner', '-loglevel', 'error', '-nostdin', '-i', file, '-vf', `crop=${ROI.w}:${ROI.h}:${ROI.x}:${ROI.y},format=gray`, '-f', 'rawvideo', '-'], { stdio: ['ignore', 'pipe', 'inherit'] });
    let bytes = 0;
    child.stdout.on('data', (chunk) => { bytes += chunk.length; });
    child.on('close', (code) => { code === 0 && bytes === 600 * ROI.w * ROI.h ? resolve((performance.now() - t0) / 1000) : reject(new Error(`ffmpeg exited ${code} after ${bytes} bytes`)); });
  });
}

/** readFrames over the same crop, touching each frame; wall seconds and frame count. */
async function reader(file, header) {
  const t0 = performance.now();
  let n = 0;
  let checksum = 0;
  for await (const f of readFrames(file, { roi: ROI, pixels: 'gray', header })) { n += 1; checksum = (checksum + f.data[f.data.length >> 1]) | 0; }
  return { s: (performance.now() - t0) / 1000, frames: n, checksum };
}

/** CPU seconds used so far by this process plus its reaped children (Linux /proc/self/stat utime…cstime). */
function cpuSeconds(from = 11) {
  const fields = readFileSync('/proc/self/stat', 'utf8').replace(/^.*\) /, '').split(' ');
  const ticks = fields.slice(from, 15).reduce((a, b) => a + Number(b), 0); // utime stime cutime cstime
  return ticks / 100; // USER_HZ is 100 on Linux
}

/** Wall and CPU seconds of one run; tools_cpu_s is the reaped children's share (ffmpeg, ffprobe). */
async function measured(run) {
  const c0 = cpuSeconds();
  const k0 = cpuSeconds(13);
  const t0 = performance.now();
  const result = await run();
  return { wall_s: (performance.now() - t0) / 1000, cpu_s: cpuSeconds() - c0, tools_cpu_s: cpuSeconds(13) - k0, result };
}

const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

if (process.argv[2] === '--rss') {
  // Child mode: read the whole file, print peak resident memory of this process.
  const t0 = performance.now();
  const { frames } = await reader(process.argv[3]);
  console.log(JSON.stringify({ frames, s: (performance.now() - t0) / 1000, maxRSS_MB: process.resourceUsage().maxRSS / 1024 }));
  process.exit(0);
}

mkdirSync(out, { recursive: true });
const tools = await locateTools();
const ffmpeg = tools.ffmpeg.path;
console.error(`ffmpeg ${tools.ffmpeg.version}; ${os.cpus().length} cores, load ${os.loadavg().map((x) => x.toFixed(1)).join(' ')}`);

// 1. Wall-time ratio on 10 s of 1080p60 testsrc2 (600 frames).
const clip = makeClip(ffmpeg, join(out, 'reader-1080p60-10s.mp4'), ['-f', 'lavfi', '-i', 'testsrc2=size=1920x1080:rate=60', '-t', '10', '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p']);
await reader(clip); // warm the page cache and the tool lookup
// Interleaved runs (bare, bare piped into Node, reader, reader with the header already read) so that
// load changes hit all four. Wall time is what the target names; CPU time (ffmpeg + Node) is steadier on a loaded machine.
const header = await probeVideoHeader(clip);
const runs = { bare: [], barePiped: [], reader: [], readerWithHeader: [] };
const ROUNDS = Number(process.env.ROUNDS ?? 7);
for (let i = 0; i < ROUNDS; i++) {
  runs.bare.push(await measured(() => bare(ffmpeg, clip)));
  runs.barePiped.push(await measured(() => barePiped(ffmpeg, clip)));
  const r = await measured(() => reader(clip));
  if (r.result.frames !== 600) throw new Error(`reader returned ${r.result.frames} frames instead of 600`);
  runs.reader.push(r);
  runs.readerWithHeader.push(await measured(() => reader(clip, header)));
}
const round3 = (x) => Math.round(x * 1000) / 1000;
const summary = (xs) => ({ wall_s: xs.map((x) => round3(x.wall_s)), cpu_s: xs.map((x) => round3(x.cpu_s)), median_wall_s: round3(median(xs.map((x) => x.wall_s))), median_cpu_s: round3(median(xs.map((x) => x.cpu_s))), median_tools_cpu_s: round3(median(xs.map((x) => x.tools_cpu_s))) });
const S = { bare: summary(runs.bare), barePiped: summary(runs.barePiped), reader: summary(runs.reader), readerWithHeader: summary(runs.readerWithHeader) };
console.log(JSON.stringify({
  test: 'wall time, 1080p60 H.264, 600 frames, crop 480x480 gray', load_after: os.loadavg().map(round3), ...S,
  wall_ratio: round3(S.reader.median_wall_s / S.bare.median_wall_s), wall_ratio_with_header: round3(S.readerWithHeader.median_wall_s / S.bare.median_wall_s),
  cpu_ratio: round3(S.reader.median_cpu_s / S.bare.median_cpu_s), cpu_ratio_with_header: round3(S.readerWithHeader.median_cpu_s / S.bare.median_cpu_s),
  piped_wall_ratio: round3(S.barePiped.median_wall_s / S.bare.median_wall_s),
  wall_ratio_to_piped: round3(S.reader.median_wall_s / S.barePiped.median_wall_s), wall_ratio_to_piped_with_header: round3(S.readerWithHeader.median_wall_s / S.barePiped.median_wall_s),
}));
if (process.env.SKIP_RSS) process.exit(0);

// 2. Peak RSS over 10 minutes of 1080p60 (36 000 frames): a 10 s low-complexity segment (small testsrc2
//    scaled up with nearest-neighbour), looped 60 times by stream copy.
const seg = makeClip(ffmpeg, join(out, 'reader-1080p60-blocky-10s.mp4'), ['-f', 'lavfi', '-i', 'testsrc2=size=480x270:rate=60', '-t', '10', '-vf', 'scale=1920:1080:flags=neighbor', '-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p']);
const long = makeClip(ffmpeg, join(out, 'reader-1080p60-10min.mp4'), ['-stream_loop', '59', '-i', seg, '-c', 'copy']);
const idle = spawnSync(process.execPath, ['-e', 'console.log(process.resourceUsage().maxRSS / 1024)'], { encoding: 'utf8' });
const child = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--rss', long], { encoding: 'utf8' });
if (child.status !== 0) throw new Error(child.stderr);
console.log(JSON.stringify({ test: 'peak RSS, 10 min 1080p60, crop 480x480 gray', ...JSON.parse(child.stdout), idle_node_maxRSS_MB: Number(idle.stdout) }));
