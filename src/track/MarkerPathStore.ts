import { doubleCapacity } from './doubleCapacity.js';
import type { SpotReading } from './spotFollower.js';

/**
 * Growable per-marker, per-frame columns for several markers: the position as measured (x_px, y_px, full-frame
 * px), the position with camera motion taken off (sx_px, sy_px), quality (0–1), flag ('' when found), the spot's
 * area (px, NaN when lost) and whether it was held to the steady-size band (1/0; see SpotReading.size_held).
 */
export class MarkerPathStore {
  readonly count: number;
  n = 0;
  x_px: Float64Array[];
  y_px: Float64Array[];
  sx_px: Float64Array[];
  sy_px: Float64Array[];
  quality: Float64Array[];
  area_px: Float64Array[];
  size_held: Float64Array[];
  flag: string[][];

  constructor(count: number) {
    this.count = count;
    const make = () => Array.from({ length: count }, () => new Float64Array(1024));
    this.x_px = make();
    this.y_px = make();
    this.sx_px = make();
    this.sy_px = make();
    this.quality = make();
    this.area_px = make();
    this.size_held = make();
    this.flag = Array.from({ length: count }, () => []);
  }

  /** Appends one frame: per marker, the reading and its measured and steadied full-frame positions (px). */
  push(readings: SpotReading[], measured: { x_px: number; y_px: number }[], steadied: { x_px: number; y_px: number }[]): void {
    if (this.n === this.x_px[0].length) {
      const grow = (cols: Float64Array[]) => cols.map(doubleCapacity);
      this.x_px = grow(this.x_px);
      this.y_px = grow(this.y_px);
      this.sx_px = grow(this.sx_px);
      this.sy_px = grow(this.sy_px);
      this.quality = grow(this.quality);
      this.area_px = grow(this.area_px);
      this.size_held = grow(this.size_held);
    }
    const i = this.n++;
    for (let k = 0; k < this.count; k++) {
      this.x_px[k][i] = measured[k].x_px;
      this.y_px[k][i] = measured[k].y_px;
      this.sx_px[k][i] = steadied[k].x_px;
      this.sy_px[k][i] = steadied[k].y_px;
      this.quality[k][i] = readings[k].quality;
      this.area_px[k][i] = readings[k].area_px ?? Number.NaN;
      this.size_held[k][i] = readings[k].size_held ? 1 : 0;
      this.flag[k].push(readings[k].flag);
    }
  }

  /** Appends one frame in which no marker could be measured, with this reason for each. */
  pushLost(flag: string): void {
    const none = Array.from({ length: this.count }, () => ({ x_px: Number.NaN, y_px: Number.NaN, quality: 0, flag }));
    this.push(none, none, none);
  }

  /** The frame's summary before the path fit: found if any marker is; quality = sum of found markers' quality / count; else the first marker's reason. */
  frameOf(i: number): { quality: number; flag: string } {
    let q = 0;
    let any = false;
    for (let k = 0; k < this.count; k++) {
      if (this.flag[k][i] !== '') continue;
      any = true;
      q += this.quality[k][i];
    }
    return any ? { quality: q / this.count, flag: '' } : { quality: 0, flag: this.flag[0][i] };
  }
}
