import { open } from 'node:fs/promises';
import { RevtraceError } from '../errors.js';

/** A box of the ISO base media file format (ISO/IEC 14496-12): a leaf keeps its payload, a container its children. */
interface Box {
  type: string;
  payload?: Buffer;
  children?: Box[];
}

/** Boxes whose payload is only child boxes, on the path to the sample tables. */
const CONTAINERS = new Set(['moov', 'trak', 'mdia', 'minf', 'stbl']);

/**
 * Gives the single video track of an MP4 its own per-frame presentation times, in place: rewrites
 * the decoding-time-to-sample table (stts) so sample i starts at round(t_s[i] × timescale), sets
 * the movie, track and media durations, and adds an empty edit when the first frame starts after 0.
 * Requires what writeVideo produces: one track, no composition offsets (no B-frames), and the moov
 * box last in the file so that no chunk offset moves when moov changes size.
 * @param t_s frame presentation times, seconds, strictly increasing, first ≥ 0
 * @param lastDuration_s display duration of the last frame, seconds
 */
export async function rewriteMp4Timing(path: string, t_s: ArrayLike<number>, lastDuration_s: number): Promise<void> {
  const handle = await open(path, 'r+');
  try {
    const { size: fileSize } = await handle.stat();
    let offset = 0;
    let moovAt = -1;
    let moovSize = 0;
    const header = Buffer.alloc(16);
    while (offset < fileSize) {
      await handle.read(header, 0, 16, offset);
      let size = header.readUInt32BE(0);
      const type = header.toString('latin1', 4, 8);
      if (size === 1) size = Number(header.readBigUInt64BE(8));
      else if (size === 0) size = fileSize - offset;
      if (size < 8) throw mp4Error(path, `a box at byte ${offset} has an impossible size`);
      if (type === 'moov') { moovAt = offset; moovSize = size; }
      offset += size;
    }
    if (moovAt < 0) throw mp4Error(path, 'it has no moov box');
    if (moovAt + moovSize !== fileSize) throw mp4Error(path, 'its moov box is not at the end of the file');
    const moovBytes = Buffer.alloc(moovSize);
    await handle.read(moovBytes, 0, moovSize, moovAt);
    const moov = parseBoxes(moovBytes, 0, moovSize)[0]!;
    retime(moov, t_s, lastDuration_s, path);
    const out = serialize(moov);
    await handle.write(out, 0, out.length, moovAt);
    await handle.truncate(moovAt + out.length);
    await handle.sync();
  } finally {
    await handle.close();
  }
}

function mp4Error(path: string, what: string): RevtraceError {
  return new RevtraceError(`Could not set the frame times in ${path}: ${what}.`);
}

function parseBoxes(buf: Buffer, start: number, end: number): Box[] {
  const boxes: Box[] = [];
  let at = start;
  while (at + 8 <= end) {
    let size = buf.readUInt32BE(at);
    const type = buf.toString('latin1', at + 4, at + 8);
    let headerSize = 8;
    if (size === 1) { size = Number(buf.readBigUInt64BE(at + 8)); headerSize = 16; }
    else if (size === 0) size = end - at;
    if (size < headerSize || at + size > end) throw new RevtraceError(`A ${type} box in the MP4 index is damaged.`);
    if (CONTAINERS.has(type)) boxes.push({ type, children: parseBoxes(buf, at + headerSize, at + size) });
    else boxes.push({ type, payload: buf.subarray(at + headerSize, at + size) });
    at += size;
  }
  return boxes;
}

function serialize(box: Box): Buffer {
  const body = box.children ? Buffer.concat(box.children.map(serialize)) : box.payload!;
  const head = Buffer.alloc(8);
  head.writeUInt32BE(body.length + 8, 0);
  head.write(box.type, 4, 'latin1');
  return Buffer.concat([head, body]);
}

function child(box: Box, type: string): Box | undefined {
  return box.children?.find((b) => b.type === type);
}

/** Writes a duration field of a version-0 (32-bit) or version-1 (64-bit) full box. */
function writeDuration(payload: Buffer, v0Offset: number, v1Offset: number, value: number, what: string): void {
  if (payload[0] === 1) payload.writeBigUInt64BE(BigInt(value), v1Offset);
  else if (value <= 0xffffffff) payload.writeUInt32BE(value, v0Offset);
  else throw new RevtraceError(`The clip is too long for a 32-bit ${what} duration.`);
}

function retime(moov: Box, t_s: ArrayLike<number>, lastDuration_s: number, path: string): void {
  const traks = moov.children!.filter((b) => b.type === 'trak');
  if (traks.length !== 1) throw mp4Error(path, `it has ${traks.length} tracks instead of one`);
  const trak = traks[0]!;
  const mdia = child(trak, 'mdia');
  const mdhd = mdia && child(mdia, 'mdhd');
  const stbl = mdia && child(mdia, 'minf') && child(child(mdia, 'minf')!, 'stbl');
  const stts = stbl && child(stbl, 'stts');
  const stsz = stbl && child(stbl, 'stsz');
  const mvhd = child(moov, 'mvhd');
  const tkhd = child(trak, 'tkhd');
  if (!mdia || !mdhd || !stbl || !stts || !stsz || !mvhd || !tkhd) throw mp4Error(path, 'its track lacks a timing table');
  if (child(stbl, 'ctts')) throw mp4Error(path, 'it has composition offsets (B-frames)');

  const n = t_s.length;
  const sampleCount = stsz.payload!.readUInt32BE(8);
  if (sampleCount !== n) throw mp4Error(path, `it holds ${sampleCount} frames but ${n} were written`);
  const mdhdP = mdhd.payload!;
  const timescale = mdhdP[0] === 1 ? mdhdP.readUInt32BE(20) : mdhdP.readUInt32BE(12);

  // Sample start ticks, rounded once each so that no error accumulates along the clip.
  const ticks = new Array<number>(n);
  for (let i = 0; i < n; i++) ticks[i] = Math.round(t_s[i]! * timescale);
  const deltas: number[] = [];
  for (let i = 0; i + 1 < n; i++) {
    const d = ticks[i + 1]! - ticks[i]!;
    if (d < 1) throw new RevtraceError(`Frames ${i} and ${i + 1} (t = ${t_s[i]} s and ${t_s[i + 1]} s) are closer than the file's time step of 1/${timescale} s.`);
    deltas.push(d);
  }
  deltas.push(Math.max(1, Math.round(lastDuration_s * timescale)));
  const start = ticks[0]!;
  const mediaDuration = deltas.reduce((a, b) => a + b, 0);
  const movieDuration = start + mediaDuration;

  // stts: run-length (count, delta) pairs
  const runs: Array<[number, number]> = [];
  for (const d of deltas) {
    const last = runs[runs.length - 1];
    if (last && last[1] === d) last[0] += 1;
    else runs.push([1, d]);
  }
  const sttsP = Buffer.alloc(8 + 8 * runs.length);
  sttsP.writeUInt32BE(runs.length, 4);
  runs.forEach(([count, delta], k) => { sttsP.writeUInt32BE(count, 8 + 8 * k); sttsP.writeUInt32BE(delta, 12 + 8 * k); });
  stts.payload = sttsP;

  // Movie timescale = media timescale, so the empty edit keeps the first frame's time exactly.
  const mvhdP = Buffer.from(mvhd.payload!);
  if (mvhdP[0] === 1) mvhdP.writeUInt32BE(timescale, 20);
  else mvhdP.writeUInt32BE(timescale, 12);
  writeDuration(mvhdP, 16, 24, movieDuration, 'movie');
  mvhd.payload = mvhdP;
  const tkhdP = Buffer.from(tkhd.payload!);
  writeDuration(tkhdP, 20, 28, movieDuration, 'track');
  tkhd.payload = tkhdP;
  const newMdhd = Buffer.from(mdhdP);
  writeDuration(newMdhd, 16, 24, mediaDuration, 'media');
  mdhd.payload = newMdhd;

  // Edit list: an empty edit for a late first frame, then the whole media at normal speed.
  const edits: Array<[number, number]> = start > 0 ? [[start, -1], [mediaDuration, 0]] : [[mediaDuration, 0]];
  const elstP = Buffer.alloc(8 + 20 * edits.length);
  elstP[0] = 1; // version 1: 64-bit durations and media times
  elstP.writeUInt32BE(edits.length, 4);
  edits.forEach(([duration, mediaTime], k) => {
    const at = 8 + 20 * k;
    elstP.writeBigUInt64BE(BigInt(duration), at);
    elstP.writeBigInt64BE(BigInt(mediaTime), at + 8);
    elstP.writeInt16BE(1, at + 16); // media rate 1.0
  });
  const edts: Box = { type: 'edts', children: [{ type: 'elst', payload: elstP }] };
  const kids = trak.children!.filter((b) => b.type !== 'edts');
  kids.splice(kids.indexOf(tkhd) + 1, 0, edts);
  trak.children = kids;
}
