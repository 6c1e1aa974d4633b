import { InputError } from '../errors.js';
import type { RotationProfile, SequencePhase } from './rotationProfile.js';

/** An RGB colour, each channel 0–255. */
export type Rgb = [number, number, number];

/** The rotor's hub: a disc in the rotor plane (seen as an ellipse under an oblique view). */
export interface SynthHub {
  /** Centre of rotation in the unshaken image, px (pixel centres at integer coordinates). */
  cx_px: number;
  cy_px: number;
  radius_px: number;
  /** Gray level of the hub disc, 0–255. */
  level: number;
}

/** One marker painted on the rotor: a disc of radius size_px at radius_px from the centre. */
export interface SynthMarker {
  /** Distance from the centre of rotation, px (in the rotor plane). */
  radius_px: number;
  /** Angle of the marker when the rotor angle is 0, degrees CCW. */
  phase_deg: number;
  /** Radius of the marker disc, px. */
  size_px: number;
  /** bright/dark: gray `level`; color: `rgb` (needs channels 3). */
  kind: 'bright' | 'dark' | 'color';
  /** Gray level for bright/dark markers, 0–255 (defaults 235 bright, 20 dark). */
  level: number;
  /** Colour for kind 'color'. */
  rgb: Rgb;
}

/** A fixed fiducial in the scene (a 4×4 checkerboard square) that an anchor region can lock onto. */
export interface SynthFiducial {
  /** Top-left corner and side of the square, px, unshaken image. */
  x_px: number;
  y_px: number;
  size_px: number;
}

/** The still scene behind the rotor. */
export interface SynthBackground {
  /** Gray level, 0–255. */
  level: number;
  /** Fixed checkerboard square, or null for none. */
  fiducial: SynthFiducial | null;
  /** Row of a horizontal tank edge (a dark rim with a light lip below it), px, or null for none. */
  tank_edge_y_px: number | null;
}

/** Realism effects; every one is off by default. */
export interface SynthRealism {
  /** Sensor noise: standard deviation in gray levels, fresh per frame from the seed (0 = off). */
  noise_sigma: number;
  /** Motion blur: exposure time centred on each frame time, seconds (0 = off). */
  exposure_s: number;
  /** Compression: x264 constant rate factor 0–51, or null for a lossless file (default). */
  crf: number | null;
  /** Lighting flicker: global gain 1 + amplitude·sin(2π·frequency·t + phase) (amplitude 0 = off). */
  flicker: { amplitude: number; frequency_hz: number };
  /** Camera shake: smooth seeded random translation (rms px) and rotation (rms deg) of the whole image up to bandwidth_hz. */
  shake: { translation_px: number; rotation_deg: number; bandwidth_hz: number };
  /** Oblique view: rotor plane tilted by tilt_deg about an in-image axis at axis_deg (CCW from +x); 0 = face-on. */
  oblique: { tilt_deg: number; axis_deg: number };
  /** Drifting particles crossing the marker path in about `share` of the frames (0 = off). */
  particles: { share: number; size_px: number; speed_px_s: number; level: number };
  /** Random-looking texture on the hub disc that turns with the rotor. */
  hub_texture: boolean;
  /** Variable frame timing: each frame time moved by up to ±jitter_s; nominal frame slots in `dropped_frames` are left out. */
  timing: { jitter_s: number; dropped_frames: number[] };
}

/** A complete, JSON-serialisable description of a synthetic clip. */
export interface SynthSpec {
  seed: number;
  width_px: number;
  height_px: number;
  /** Nominal frame rate, frames per second. */
  fps: number;
  duration_s: number;
  /** 1 = gray, 3 = RGB (needed for colour markers). */
  channels: 1 | 3;
  hub: SynthHub;
  markers: SynthMarker[];
  background: SynthBackground;
  profile: RotationProfile;
  realism: SynthRealism;
}

/** A marker as given by a caller: every field optional. */
export type SynthMarkerInput = Partial<SynthMarker>;

/** What a caller may give: any subset of the spec, nested objects partial too. */
export interface SynthSpecInput {
  seed?: number;
  width_px?: number;
  height_px?: number;
  fps?: number;
  duration_s?: number;
  channels?: 1 | 3;
  hub?: Partial<SynthHub>;
  markers?: SynthMarkerInput[];
  background?: { level?: number; fiducial?: Partial<SynthFiducial> | null; tank_edge_y_px?: number | null };
  profile?: Partial<RotationProfile> & { kind?: RotationProfile['kind'] };
  realism?: {
    noise_sigma?: number;
    exposure_s?: number;
    crf?: number | null;
    flicker?: Partial<SynthRealism['flicker']>;
    shake?: Partial<SynthRealism['shake']>;
    oblique?: Partial<SynthRealism['oblique']>;
    particles?: Partial<SynthRealism['particles']>;
    hub_texture?: boolean;
    timing?: Partial<SynthRealism['timing']>;
  };
}

/** Number of nominal frame slots of a spec (before drops). */
export function nominalFrameCount(spec: Pick<SynthSpec, 'fps' | 'duration_s'>): number {
  return Math.max(1, Math.round(spec.duration_s * spec.fps));
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** A range bound shown to a person: six significant digits, rounded inwards so that the shown value is itself allowed. */
function shownBound(x: number, inwards: 'up' | 'down'): string {
  const near = Number(x.toPrecision(6));
  if (near === x || !Number.isFinite(x)) return String(x);
  const step = 10 ** (Math.floor(Math.log10(Math.abs(x))) - 5);
  const inside = inwards === 'up' ? (near > x ? near : near + step) : near < x ? near : near - step;
  return String(Number(inside.toPrecision(6)));
}

/** Checks a finite number within [min, max]; the message names the field and the allowed range. */
function num(value: unknown, name: string, min: number, max: number, fallback: number, integer = false): number {
  const v = value === undefined ? fallback : value;
  const lo = shownBound(min, 'up');
  const hi = shownBound(max, 'down');
  if (typeof v !== 'number' || !Number.isFinite(v)) {
    throw new InputError(`synth ${name} must be a number, got ${JSON.stringify(value)}; give a value from ${lo} to ${hi}`);
  }
  if (integer && !Number.isInteger(v)) throw new InputError(`synth ${name} must be a whole number, got ${v}; give an integer from ${lo} to ${hi}`);
  if (v < min || v > max) throw new InputError(`synth ${name} is ${v}, outside ${lo}–${hi}; give a value in that range`);
  return v;
}

function rgb(value: unknown, name: string, fallback: Rgb): Rgb {
  const v = value === undefined ? fallback : value;
  if (!Array.isArray(v) || v.length !== 3 || v.some((c) => typeof c !== 'number' || !Number.isFinite(c) || c < 0 || c > 255)) {
    throw new InputError(`synth ${name} must be three numbers 0–255 like [220, 40, 40], got ${JSON.stringify(value)}`);
  }
  return [v[0], v[1], v[2]];
}

function checkKeys(obj: Record<string, unknown>, allowed: string[], where: string): void {
  for (const key of Object.keys(obj)) {
    if (!allowed.includes(key)) throw new InputError(`synth ${where} has an unknown field "${key}"; known fields are ${allowed.join(', ')}`);
  }
}

const BIG = 1e7;

/** Resolves a rotation profile, filling defaults and checking ranges. */
function resolveProfile(input: unknown): RotationProfile {
  const p = input === undefined ? { kind: 'steady' } : input;
  if (!isObject(p)) throw new InputError(`synth profile must be an object with a "kind" of steady, spinup, coastdown or sequence`);
  const angle0_deg = num(p.angle0_deg, 'profile.angle0_deg', -BIG, BIG, 0);
  switch (p.kind) {
    case 'steady':
      checkKeys(p, ['kind', 'angle0_deg', 'rate_deg_s'], 'profile');
      return { kind: 'steady', angle0_deg, rate_deg_s: num(p.rate_deg_s, 'profile.rate_deg_s', -1e5, 1e5, 90) };
    case 'spinup':
      checkKeys(p, ['kind', 'angle0_deg', 't0_s', 'terminal_rate_deg_s', 'tau_s'], 'profile');
      return {
        kind: 'spinup',
        angle0_deg,
        t0_s: num(p.t0_s, 'profile.t0_s', 0, BIG, 0.2),
        terminal_rate_deg_s: num(p.terminal_rate_deg_s, 'profile.terminal_rate_deg_s', -1e5, 1e5, 360),
        tau_s: num(p.tau_s, 'profile.tau_s', 1e-3, BIG, 0.5),
      };
    case 'coastdown': {
      checkKeys(p, ['kind', 'angle0_deg', 't0_s', 'start_rate_deg_s', 'coulomb_deg_s2', 'viscous_per_s'], 'profile');
      const out = {
        kind: 'coastdown' as const,
        angle0_deg,
        t0_s: num(p.t0_s, 'profile.t0_s', 0, BIG, 0.2),
        start_rate_deg_s: num(p.start_rate_deg_s, 'profile.start_rate_deg_s', -1e5, 1e5, 360),
        coulomb_deg_s2: num(p.coulomb_deg_s2, 'profile.coulomb_deg_s2', 0, 1e7, 60),
        viscous_per_s: num(p.viscous_per_s, 'profile.viscous_per_s', 0, 1e3, 0.5),
      };
      if (out.coulomb_deg_s2 === 0 && out.viscous_per_s === 0) {
        throw new InputError('synth coast-down has neither Coulomb nor viscous friction, so it would never slow; give coulomb_deg_s2 or viscous_per_s above 0');
      }
      return out;
    }
    case 'sequence': {
      checkKeys(p, ['kind', 'angle0_deg', 'phases'], 'profile');
      const phasesIn = p.phases === undefined ? defaultPhases() : p.phases;
      if (!Array.isArray(phasesIn) || phasesIn.length === 0) throw new InputError('synth profile.phases must be a non-empty list of phases (rest, spinup, steady, coastdown)');
      return { kind: 'sequence', angle0_deg, phases: phasesIn.map((ph, i) => resolvePhase(ph, i)) };
    }
    default:
      throw new InputError(`synth profile kind ${JSON.stringify(p.kind)} is unknown; use steady, spinup, coastdown or sequence`);
  }
}

/**
 * Default sequence, sized for the default 2 s clip: 0.2 s rest, 0.6 s spin-up towards 360 deg/s (τ 0.2 s),
 * 0.4 s steady, then a coast-down (c = 360 deg/s², k = 0.5 /s) that stops just before 2 s.
 */
function defaultPhases(): SequencePhase[] {
  return [
    { kind: 'rest', duration_s: 0.2 },
    { kind: 'spinup', duration_s: 0.6, terminal_rate_deg_s: 360, tau_s: 0.2 },
    { kind: 'steady', duration_s: 0.4 },
    { kind: 'coastdown', duration_s: 1, coulomb_deg_s2: 360, viscous_per_s: 0.5 },
  ];
}

function resolvePhase(ph: unknown, i: number): SequencePhase {
  const where = `profile.phases[${i}]`;
  if (!isObject(ph)) throw new InputError(`synth ${where} must be an object with a "kind" of rest, spinup, steady or coastdown`);
  const duration_s = num(ph.duration_s, `${where}.duration_s`, 1e-3, BIG, 1);
  switch (ph.kind) {
    case 'rest':
      if (i !== 0) throw new InputError(`synth ${where} is a rest phase after the rotor has started; rest may only be the first phase (a coast-down ends at rest by itself)`);
      checkKeys(ph, ['kind', 'duration_s'], where);
      return { kind: 'rest', duration_s };
    case 'steady':
      checkKeys(ph, ['kind', 'duration_s'], where);
      return { kind: 'steady', duration_s };
    case 'spinup':
      checkKeys(ph, ['kind', 'duration_s', 'terminal_rate_deg_s', 'tau_s'], where);
      return {
        kind: 'spinup',
        duration_s,
        terminal_rate_deg_s: num(ph.terminal_rate_deg_s, `${where}.terminal_rate_deg_s`, -1e5, 1e5, 360),
        tau_s: num(ph.tau_s, `${where}.tau_s`, 1e-3, BIG, 0.5),
      };
    case 'coastdown': {
      checkKeys(ph, ['kind', 'duration_s', 'coulomb_deg_s2', 'viscous_per_s'], where);
      const c = num(ph.coulomb_deg_s2, `${where}.coulomb_deg_s2`, 0, 1e7, 60);
      const k = num(ph.viscous_per_s, `${where}.viscous_per_s`, 0, 1e3, 0.5);
      if (c === 0 && k === 0) throw new InputError(`synth ${where} has neither Coulomb nor viscous friction; give coulomb_deg_s2 or viscous_per_s above 0`);
      return { kind: 'coastdown', duration_s, coulomb_deg_s2: c, viscous_per_s: k };
    }
    default:
      throw new InputError(`synth ${where} kind ${JSON.stringify(ph.kind)} is unknown; use rest, spinup, steady or coastdown`);
  }
}

function resolveMarker(m: unknown, i: number, hubRadius: number): SynthMarker {
  const where = `markers[${i}]`;
  if (!isObject(m)) throw new InputError(`synth ${where} must be an object with radius_px, phase_deg, size_px and kind`);
  checkKeys(m, ['radius_px', 'phase_deg', 'size_px', 'kind', 'level', 'rgb'], where);
  const kind = m.kind === undefined ? 'bright' : m.kind;
  if (kind !== 'bright' && kind !== 'dark' && kind !== 'color') {
    throw new InputError(`synth ${where}.kind ${JSON.stringify(m.kind)} is unknown; use bright, dark or color`);
  }
  return {
    radius_px: num(m.radius_px, `${where}.radius_px`, 0, 1e4, Math.round(hubRadius * 0.75)),
    phase_deg: num(m.phase_deg, `${where}.phase_deg`, -360, 360, 0),
    size_px: num(m.size_px, `${where}.size_px`, 0.5, 200, 4),
    kind,
    level: num(m.level, `${where}.level`, 0, 255, kind === 'dark' ? 20 : 235),
    rgb: rgb(m.rgb, `${where}.rgb`, [220, 40, 40]),
  };
}

/**
 * Fills every missing field of a synthetic-clip description with its default and checks every range,
 * throwing an InputError with one sentence on the first problem. Idempotent on a resolved spec.
 */
export function resolveSynthSpec(partial: SynthSpecInput = {}): SynthSpec {
  if (!isObject(partial)) throw new InputError('synth spec must be a JSON object');
  checkKeys(partial, ['seed', 'width_px', 'height_px', 'fps', 'duration_s', 'channels', 'hub', 'markers', 'background', 'profile', 'realism'], 'spec');
  const seed = num(partial.seed, 'seed', 0, 0xffffffff, 1, true);
  const width_px = num(partial.width_px, 'width_px', 16, 4096, 320, true);
  const height_px = num(partial.height_px, 'height_px', 16, 4096, 240, true);
  if (width_px % 2 || height_px % 2) throw new InputError(`synth frame size ${width_px}×${height_px} has an odd side, which the video encoder cannot store; give even numbers`);
  const fps = num(partial.fps, 'fps', 1, 1000, 30);
  const duration_s = num(partial.duration_s, 'duration_s', 1e-3, 3600, 2);
  if (nominalFrameCount({ fps, duration_s }) < 2) throw new InputError(`synth clip of ${duration_s} s at ${fps} fps has fewer than 2 frames; make it longer`);

  const hubIn = partial.hub ?? {};
  if (!isObject(hubIn)) throw new InputError('synth hub must be an object with cx_px, cy_px, radius_px and level');
  checkKeys(hubIn, ['cx_px', 'cy_px', 'radius_px', 'level'], 'hub');
  const hub: SynthHub = {
    cx_px: num(hubIn.cx_px, 'hub.cx_px', 0, width_px - 1, width_px / 2),
    cy_px: num(hubIn.cy_px, 'hub.cy_px', 0, height_px - 1, height_px / 2),
    radius_px: num(hubIn.radius_px, 'hub.radius_px', 2, 1e4, Math.round(0.45 * Math.min(width_px, height_px))),
    level: num(hubIn.level, 'hub.level', 0, 255, 110),
  };

  const markersIn = partial.markers === undefined ? [{}] : partial.markers;
  if (!Array.isArray(markersIn)) throw new InputError('synth markers must be a list of marker objects (it may be empty with hub_texture on)');
  const markers = markersIn.map((m, i) => resolveMarker(m, i, hub.radius_px));
  for (const [i, m] of markers.entries()) {
    const reach = m.radius_px + m.size_px;
    if (hub.cx_px - reach < 0 || hub.cx_px + reach > width_px - 1 || hub.cy_px - reach < 0 || hub.cy_px + reach > height_px - 1) {
      throw new InputError(`synth markers[${i}] path (radius ${m.radius_px} px plus size ${m.size_px} px around ${hub.cx_px},${hub.cy_px}) leaves the ${width_px}×${height_px} frame; use a smaller radius or a larger frame`);
    }
  }

  const channelsIn = partial.channels;
  const wantsColour = markers.some((m) => m.kind === 'color');
  if (channelsIn !== undefined && channelsIn !== 1 && channelsIn !== 3) throw new InputError(`synth channels is ${JSON.stringify(channelsIn)}; use 1 (gray) or 3 (RGB)`);
  const channels: 1 | 3 = channelsIn ?? (wantsColour ? 3 : 1);
  if (wantsColour && channels !== 3) throw new InputError('synth has a colour marker but channels is 1; set channels to 3 (RGB mode)');

  const bgIn = partial.background ?? {};
  if (!isObject(bgIn)) throw new InputError('synth background must be an object with level, fiducial and tank_edge_y_px');
  checkKeys(bgIn, ['level', 'fiducial', 'tank_edge_y_px'], 'background');
  let fiducial: SynthFiducial | null = null;
  if (bgIn.fiducial !== null) {
    const fIn = bgIn.fiducial ?? {};
    if (!isObject(fIn)) throw new InputError('synth background.fiducial must be an object with x_px, y_px, size_px, or null for none');
    checkKeys(fIn, ['x_px', 'y_px', 'size_px'], 'background.fiducial');
    const side = Math.max(8, Math.round(Math.min(width_px, height_px) / 10));
    const size_px = num(fIn.size_px, 'background.fiducial.size_px', 4, Math.min(width_px, height_px), side, true);
    fiducial = {
      x_px: num(fIn.x_px, 'background.fiducial.x_px', 0, width_px - size_px, Math.max(0, Math.round(size_px / 3)), true),
      y_px: num(fIn.y_px, 'background.fiducial.y_px', 0, height_px - size_px, Math.max(0, Math.round(size_px / 3)), true),
      size_px,
    };
  }
  const tank = bgIn.tank_edge_y_px === undefined || bgIn.tank_edge_y_px === null ? null : num(bgIn.tank_edge_y_px, 'background.tank_edge_y_px', 0, height_px - 1, 0);
  const background: SynthBackground = { level: num(bgIn.level, 'background.level', 0, 255, 60), fiducial, tank_edge_y_px: tank };

  const profile = resolveProfile(partial.profile);
  const realism = resolveRealism(partial.realism, fps, nominalFrameCount({ fps, duration_s }));
  if (markers.length === 0 && !realism.hub_texture) {
    throw new InputError('synth has no markers and no hub texture, so nothing visible turns; add a marker or turn hub_texture on');
  }
  return { seed, width_px, height_px, fps, duration_s, channels, hub, markers, background, profile, realism };
}

function sub(obj: unknown, name: string, keys: string[]): Record<string, unknown> {
  const v = obj ?? {};
  if (!isObject(v)) throw new InputError(`synth realism.${name} must be an object with ${keys.join(', ')}`);
  checkKeys(v, keys, `realism.${name}`);
  return v;
}

function resolveRealism(input: unknown, fps: number, slots: number): SynthRealism {
  const r = input ?? {};
  if (!isObject(r)) throw new InputError('synth realism must be an object');
  checkKeys(r, ['noise_sigma', 'exposure_s', 'crf', 'flicker', 'shake', 'oblique', 'particles', 'hub_texture', 'timing'], 'realism');
  const flicker = sub(r.flicker, 'flicker', ['amplitude', 'frequency_hz']);
  const shake = sub(r.shake, 'shake', ['translation_px', 'rotation_deg', 'bandwidth_hz']);
  const oblique = sub(r.oblique, 'oblique', ['tilt_deg', 'axis_deg']);
  const particles = sub(r.particles, 'particles', ['share', 'size_px', 'speed_px_s', 'level']);
  const timing = sub(r.timing, 'timing', ['jitter_s', 'dropped_frames']);
  const interval_s = 1 / fps;
  const crf = r.crf === undefined || r.crf === null ? null : num(r.crf, 'realism.crf', 0, 51, 23, true);
  const hub_texture = r.hub_texture === undefined ? false : r.hub_texture;
  if (typeof hub_texture !== 'boolean') throw new InputError(`synth realism.hub_texture must be true or false, got ${JSON.stringify(r.hub_texture)}`);
  const droppedIn = timing.dropped_frames === undefined ? [] : timing.dropped_frames;
  if (!Array.isArray(droppedIn)) throw new InputError('synth realism.timing.dropped_frames must be a list of frame slot numbers');
  const dropped = droppedIn.map((d, i) => num(d, `realism.timing.dropped_frames[${i}]`, 1, slots - 1, 1, true));
  const sorted = [...new Set(dropped)].sort((a, b) => a - b);
  if (sorted.length !== dropped.length) throw new InputError('synth realism.timing.dropped_frames lists a frame slot twice; list each slot once');
  if (sorted.length > slots / 2) throw new InputError(`synth drops ${sorted.length} of ${slots} frame slots; drop at most half`);
  return {
    noise_sigma: num(r.noise_sigma, 'realism.noise_sigma', 0, 100, 0),
    exposure_s: num(r.exposure_s, 'realism.exposure_s', 0, interval_s, 0),
    crf,
    flicker: {
      amplitude: num(flicker.amplitude, 'realism.flicker.amplitude', 0, 0.9, 0),
      frequency_hz: num(flicker.frequency_hz, 'realism.flicker.frequency_hz', 1e-3, 1e4, 3),
    },
    shake: {
      translation_px: num(shake.translation_px, 'realism.shake.translation_px', 0, 100, 0),
      rotation_deg: num(shake.rotation_deg, 'realism.shake.rotation_deg', 0, 10, 0),
      bandwidth_hz: num(shake.bandwidth_hz, 'realism.shake.bandwidth_hz', 0.05, fps / 2, Math.min(4, fps / 2)),
    },
    oblique: {
      tilt_deg: num(oblique.tilt_deg, 'realism.oblique.tilt_deg', 0, 85, 0),
      axis_deg: num(oblique.axis_deg, 'realism.oblique.axis_deg', -360, 360, 0),
    },
    particles: {
      share: num(particles.share, 'realism.particles.share', 0, 0.8, 0),
      size_px: num(particles.size_px, 'realism.particles.size_px', 0.5, 100, 5),
      speed_px_s: num(particles.speed_px_s, 'realism.particles.speed_px_s', 1, 1e5, 60),
      level: num(particles.level, 'realism.particles.level', 0, 255, 200),
    },
    hub_texture,
    timing: {
      jitter_s: num(timing.jitter_s, 'realism.timing.jitter_s', 0, 0.4 * interval_s, 0),
      dropped_frames: sorted,
    },
  };
}
