import type { Command } from 'commander';
import { readFile, stat } from 'node:fs/promises';
import { basename, dirname } from 'node:path';
import { ensureWritableFolder } from '../ensureWritableFolder.js';
import { InputError } from '../errors.js';
import { anchorRegion } from '../synth/anchorRegion.js';
import type { SynthMarkerInput, SynthSpecInput } from '../synth/SynthSpec.js';
import { resolveSynthSpec } from '../synth/SynthSpec.js';
import { globalOptions } from './globalOptions.js';

interface SynthCliOptions {
  out?: string;
  spec?: string;
  size?: string;
  fps?: string;
  duration?: string;
  seed?: string;
  rgb?: boolean;
  hub?: string;
  hubLevel?: string;
  marker?: string[];
  backgroundLevel?: string;
  fiducial?: boolean;
  tankEdge?: string;
  rate?: string;
  spinUp?: string;
  coastDown?: string;
  cycle?: string;
  angle0?: string;
  noise?: string;
  exposure?: string;
  crf?: string;
  flicker?: string;
  shake?: string;
  tilt?: string;
  particles?: string;
  hubTexture?: boolean;
  jitter?: string;
  drop?: string;
  quiet?: boolean;
}

/** Parses "a,b,c" into between min and max finite numbers; one sentence naming the option otherwise. */
function numbers(option: string, value: string, min: number, max: number, shape: string): number[] {
  const parts = value.split(',').map((p) => p.trim());
  const out = parts.map(Number);
  if (parts.length < min || parts.length > max || parts.some((p) => p === '') || out.some((v) => !Number.isFinite(v))) {
    throw new InputError(`${option} "${value}" is not understood; give ${shape}`);
  }
  return out;
}

function one(option: string, value: string | undefined, shape: string): number | undefined {
  return value === undefined ? undefined : numbers(option, value, 1, 1, shape)[0];
}

/** `--marker radius[,phase[,size[,kind]]]` with kind bright, dark or #rrggbb. */
function parseMarker(value: string): SynthMarkerInput {
  const shape = 'radius_px[,phase_deg[,size_px[,bright|dark|#rrggbb]]] like 80,0,4,bright';
  const parts = value.split(',').map((p) => p.trim());
  const kindText = parts.length === 4 ? parts.pop()! : undefined;
  const [radius_px, phase_deg, size_px] = numbers('--marker', parts.join(','), 1, 3, shape);
  const marker: SynthMarkerInput = { radius_px, phase_deg, size_px };
  if (kindText === undefined) return marker;
  if (kindText === 'bright' || kindText === 'dark') return { ...marker, kind: kindText };
  const hex = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(kindText);
  if (!hex) throw new InputError(`--marker "${value}" has kind "${kindText}"; give bright, dark or a colour like #dd2020`);
  return { ...marker, kind: 'color', rgb: [parseInt(hex[1], 16), parseInt(hex[2], 16), parseInt(hex[3], 16)] };
}

/** Reads a spec file: a SynthSpec (partial allowed) or a `.synth.json` sidecar written by renderClip. */
async function readSpecFile(path: string): Promise<SynthSpecInput> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    throw new InputError(`cannot read --spec file ${path} (${(err as NodeJS.ErrnoException).code ?? 'unreadable'}); check the path`);
  }
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    throw new InputError(`--spec file ${path} is not valid JSON; fix the file or write it with revtrace synth`);
  }
  if (typeof parsed === 'object' && parsed !== null && 'spec' in parsed && 'software' in parsed) return (parsed as { spec: SynthSpecInput }).spec;
  return parsed as SynthSpecInput;
}

/** Lays option overrides over a base spec: nested objects merge field by field; markers and profile are replaced whole. */
function mergeSpec(base: SynthSpecInput, over: SynthSpecInput): SynthSpecInput {
  const r = { ...(base.realism ?? {}) } as Record<string, unknown>;
  for (const [key, value] of Object.entries(over.realism ?? {})) {
    const before = r[key];
    r[key] = typeof value === 'object' && value !== null && !Array.isArray(value) && typeof before === 'object' && before !== null
      ? { ...before, ...value }
      : value;
  }
  return {
    ...base,
    ...over,
    hub: { ...(base.hub ?? {}), ...(over.hub ?? {}) },
    background: { ...(base.background ?? {}), ...(over.background ?? {}) },
    realism: r as SynthSpecInput['realism'],
  };
}

/** Turns command-line options into a partial spec (only the options given). */
function optionsToSpec(o: SynthCliOptions): SynthSpecInput {
  const spec: SynthSpecInput = {};
  if (o.size !== undefined) {
    const m = /^\s*(\d+)\s*[x×]\s*(\d+)\s*$/i.exec(o.size);
    if (!m) throw new InputError(`--size "${o.size}" is not understood; give width x height in pixels like 320x240`);
    spec.width_px = Number(m[1]);
    spec.height_px = Number(m[2]);
  }
  spec.fps = one('--fps', o.fps, 'frames per second like 30');
  spec.duration_s = one('--duration', o.duration, 'seconds like 2');
  spec.seed = one('--seed', o.seed, 'a whole number like 7');
  if (o.rgb) spec.channels = 3;
  if (o.hub !== undefined || o.hubLevel !== undefined) {
    const [cx_px, cy_px, radius_px] = o.hub === undefined ? [] : numbers('--hub', o.hub, 3, 3, 'x,y,radius in pixels like 160,120,100');
    spec.hub = { cx_px, cy_px, radius_px, level: one('--hub-level', o.hubLevel, 'a gray level 0–255 like 110') };
  }
  if (o.marker && o.marker.length > 0) spec.markers = o.marker.length === 1 && o.marker[0].trim() === 'none' ? [] : o.marker.map(parseMarker);
  spec.background = {
    level: one('--background-level', o.backgroundLevel, 'a gray level 0–255 like 60'),
    ...(o.fiducial === false ? { fiducial: null } : {}),
    ...(o.tankEdge !== undefined ? { tank_edge_y_px: one('--tank-edge', o.tankEdge, 'an image row in pixels like 220') } : {}),
  };

  const profiles = [o.rate && '--rate', o.spinUp && '--spin-up', o.coastDown && '--coast-down', o.cycle && '--cycle'].filter(Boolean);
  if (profiles.length > 1) throw new InputError(`${profiles.join(' and ')} both set a rotation profile; give only one of --rate, --spin-up, --coast-down, --cycle`);
  const angle0_deg = one('--angle0', o.angle0, 'degrees like 0');
  if (o.rate !== undefined) spec.profile = { kind: 'steady', angle0_deg, rate_deg_s: one('--rate', o.rate, 'deg/s like 90 or -0.5') };
  if (o.spinUp !== undefined) {
    const [t0_s, terminal_rate_deg_s, tau_s] = numbers('--spin-up', o.spinUp, 3, 3, 'onset_s,terminal_deg_s,tau_s like 0.2,360,0.5');
    spec.profile = { kind: 'spinup', angle0_deg, t0_s, terminal_rate_deg_s, tau_s };
  }
  if (o.coastDown !== undefined) {
    const [start_rate_deg_s, coulomb_deg_s2, viscous_per_s, t0_s] = numbers('--coast-down', o.coastDown, 3, 4, 'start_deg_s,coulomb_deg_s2,viscous_per_s[,onset_s] like 360,60,0.5,0.2');
    spec.profile = { kind: 'coastdown', angle0_deg, start_rate_deg_s, coulomb_deg_s2, viscous_per_s, t0_s };
  }
  if (o.cycle !== undefined) {
    const [rest, terminal_rate_deg_s, tau_s, spin, steady, coulomb_deg_s2, viscous_per_s] = numbers('--cycle', o.cycle, 7, 7, 'rest_s,terminal_deg_s,tau_s,spinup_s,steady_s,coulomb_deg_s2,viscous_per_s like 0.2,360,0.2,0.6,0.4,360,0.5');
    spec.profile = {
      kind: 'sequence',
      angle0_deg,
      phases: [
        { kind: 'rest', duration_s: rest },
        { kind: 'spinup', duration_s: spin, terminal_rate_deg_s, tau_s },
        { kind: 'steady', duration_s: steady },
        { kind: 'coastdown', duration_s: 1, coulomb_deg_s2, viscous_per_s },
      ],
    };
  }
  if (profiles.length === 0 && angle0_deg !== undefined) spec.profile = { kind: 'steady', angle0_deg };

  const realism: NonNullable<SynthSpecInput['realism']> = {};
  realism.noise_sigma = one('--noise', o.noise, 'a standard deviation in gray levels like 2');
  realism.exposure_s = one('--exposure', o.exposure, 'an exposure time in seconds like 0.01');
  if (o.crf !== undefined) realism.crf = one('--crf', o.crf, 'an x264 quality 0–51 like 23');
  if (o.flicker !== undefined) {
    const [amplitude, frequency_hz] = numbers('--flicker', o.flicker, 1, 2, 'amplitude[,frequency_hz] like 0.05,3');
    realism.flicker = { amplitude, frequency_hz };
  }
  if (o.shake !== undefined) {
    const [translation_px, rotation_deg, bandwidth_hz] = numbers('--shake', o.shake, 1, 3, 'translation_px[,rotation_deg[,bandwidth_hz]] like 1.5,0.2,3');
    realism.shake = { translation_px, rotation_deg, bandwidth_hz };
  }
  if (o.tilt !== undefined) {
    const [tilt_deg, axis_deg] = numbers('--tilt', o.tilt, 1, 2, 'tilt_deg[,axis_deg] like 35,0');
    realism.oblique = { tilt_deg, axis_deg };
  }
  if (o.particles !== undefined) {
    const [share, size_px, speed_px_s] = numbers('--particles', o.particles, 1, 3, 'share[,size_px[,speed_px_s]] like 0.1,5,60');
    realism.particles = { share, size_px, speed_px_s };
  }
  if (o.hubTexture) realism.hub_texture = true;
  if (o.jitter !== undefined || o.drop !== undefined) {
    realism.timing = {
      jitter_s: one('--jitter', o.jitter, 'seconds like 0.004'),
      dropped_frames: o.drop === undefined ? undefined : numbers('--drop', o.drop, 1, 10_000, 'frame slot numbers like 12,40'),
    };
  }
  spec.realism = realism;
  return dropUndefined(spec) as SynthSpecInput;
}

/** Removes undefined fields (and objects left empty) so that they do not hide values from a --spec file. */
function dropUndefined(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(dropUndefined);
  if (typeof value !== 'object' || value === null) return value;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(value)) {
    if (v === undefined) continue;
    const cleaned = dropUndefined(v);
    if (typeof cleaned === 'object' && cleaned !== null && !Array.isArray(cleaned) && Object.keys(cleaned).length === 0) continue;
    out[k] = cleaned;
  }
  return out;
}

/** Refuses an --out that exists but was not written by synth (no spec sidecar beside it): real footage is never written over. */
async function refuseForeignVideo(videoPath: string, specPath: string): Promise<void> {
  const exists = (p: string) => stat(p).then(() => true, () => false);
  if ((await exists(videoPath)) && !(await exists(specPath))) {
    throw new InputError(`--out ${videoPath} already exists and was not made by revtrace synth (no ${basename(specPath)} beside it); choose another name, so that footage is never written over`);
  }
}

/** `revtrace synth --out clip.mp4`: renders synthetic footage with known truth (video, truth.csv, synth.json). */
export function registerSynth(program: Command): void {
  const collect = (value: string, previous: string[] = []): string[] => [...previous, value];
  program
    .command('synth')
    .description('render synthetic footage of a turning hub with known truth: <out>.mp4, <out>.truth.csv and <out>.synth.json')
    .requiredOption('--out <file.mp4>', 'video to write; the truth table and spec are written beside it')
    .option('--spec <file.json>', 'take the whole clip description from a JSON file (a spec, or a .synth.json from an earlier run); options below override it')
    .option('--size <WxH>', 'frame size in pixels (default 320x240)')
    .option('--fps <n>', 'nominal frame rate (default 30)')
    .option('--duration <s>', 'clip length in seconds (default 2)')
    .option('--seed <n>', 'seed for every random effect (default 1)')
    .option('--rgb', 'write RGB instead of gray (implied by a coloured marker)')
    .option('--hub <x,y,radius>', 'centre of rotation and hub radius in pixels (default: frame centre, 45% of the short side)')
    .option('--hub-level <0-255>', 'hub gray level (default 110)')
    .option('--marker <spec>', 'a marker: radius_px[,phase_deg[,size_px[,bright|dark|#rrggbb]]]; repeat for several, or "none" (default one bright marker at 75% of the hub radius, size 4)', collect)
    .option('--background-level <0-255>', 'background gray level (default 60)')
    .option('--no-fiducial', 'leave out the fixed checkerboard square (top-left) that an anchor region can lock onto')
    .option('--tank-edge <y>', 'draw a horizontal tank edge at this image row')
    .option('--rate <deg_s>', 'steady rotation, deg/s, counterclockwise positive (default 90)')
    .option('--spin-up <t0,rate,tau>', 'at rest until t0 s, then first-order spin-up towards rate deg/s with time constant tau s')
    .option('--coast-down <rate,c,k[,t0]>', 'turning at rate deg/s, from t0 s (default 0.2) slowing under dω/dt = −c·sign(ω) − kω until it stops')
    .option('--cycle <rest,rate,tau,spin,steady,c,k>', 'rest for rest s, spin up for spin s, hold for steady s, then coast down')
    .option('--angle0 <deg>', 'rotor angle at the start (default 0)')
    .option('--noise <sigma>', 'sensor noise, standard deviation in gray levels')
    .option('--exposure <s>', 'motion blur: exposure time per frame in seconds (at most one frame interval)')
    .option('--crf <n>', 'compress with x264 at this quality 0–51 (default: lossless)')
    .option('--flicker <amp[,hz]>', 'lighting flicker: relative gain amplitude and frequency (default 3 Hz)')
    .option('--shake <px[,deg[,hz]]>', 'camera shake: rms translation px, rms rotation deg, bandwidth Hz (default 4 Hz)')
    .option('--tilt <deg[,axis]>', 'oblique view: hub plane tilted by deg about an image axis at axis deg')
    .option('--particles <share[,size[,speed]]>', 'drifting particles over the marker in about this share of frames; radius px (default 5), speed px/s (default 60)')
    .option('--hub-texture', 'random texture on the hub that turns with it (with --marker none: texture only)')
    .option('--jitter <s>', 'variable frame timing: move each frame time by up to ± this many seconds')
    .option('--drop <slots>', 'leave out these nominal frame slots, comma-separated (e.g. 12,40)')
    .option('--quiet', 'print nothing on success')
    .action(async (o: SynthCliOptions, command: Command) => {
      const { renderClip, synthSidecarPaths } = await import('../synth/renderClip.js');
      const g = globalOptions(command);
      const base = o.spec !== undefined ? await readSpecFile(o.spec) : {};
      const spec = resolveSynthSpec(mergeSpec(base, optionsToSpec(o)));
      if (!/\.(mp4|m4v|mov)$/i.test(o.out!)) throw new InputError(`--out "${o.out}" does not end in .mp4; revtrace renders H.264 MP4 video, so give a name such as clip.mp4`);
      await refuseForeignVideo(o.out!, synthSidecarPaths(o.out!).specPath);
      await ensureWritableFolder(dirname(o.out!), 'the folder of --out');
      const clip = await renderClip(spec, o.out!, { ffmpeg: g.ffmpeg });
      if (o.quiet) return;
      const anchor = anchorRegion(spec);
      process.stdout.write(`wrote ${clip.videoPath} (${clip.frame_count} frames, ${spec.width_px}×${spec.height_px})\n`);
      process.stdout.write(`truth ${clip.truthPath}\nspec  ${clip.specPath}\n`);
      process.stdout.write(`centre ${spec.hub.cx_px},${spec.hub.cy_px}\n`);
      if (anchor) process.stdout.write(`anchor region ${anchor.x},${anchor.y},${anchor.w},${anchor.h} (fixed fiducial)\n`);
    });
}
