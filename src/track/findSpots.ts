/** A compact bright patch in a marker signal image. */
export interface Spot {
  /** Weighted centroid in the signal image's pixel coordinates (pixel centres at integers). */
  x_px: number;
  y_px: number;
  /** Pixels in the spot. */
  area_px: number;
  /** Peak minus local background level, signal units (0–255). */
  contrast: number;
  /** Robust noise level of the window, signal units. */
  noise: number;
}

/** A rectangle of pixels [x0, x1) × [y0, y1). */
export interface Window {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

export interface FindSpotsOptions {
  /** A window whose peak stands less than this many noise levels above the background holds no spot (default 8). */
  min_contrast_noise?: number;
  /** Seeds must exceed background + this share of the contrast (default 0.5). */
  seed_share?: number;
  /** Spots grow over pixels above background + this share of the contrast; weights are the excess above it (default 0.25). */
  grow_share?: number;
  /** Percentile of the window taken as its background level (default 0.8: the surface around a small marker). */
  background_percentile?: number;
  /** Largest number of spots returned, biggest first (default 16). */
  max_spots?: number;
  /** Also return spots that touch the window's border (default false: such a spot is cut off by the window, so its centroid is biased and it is not a whole marker). */
  keep_edge_spots?: boolean;
}

/** Working memory reused from call to call (findSpots runs once or more per frame; fresh arrays each time kept the garbage collector busy). */
const scratch = { hist: new Uint32Array(256), diffHist: new Uint32Array(256), visited: new Uint8Array(0), stack: [] as number[] };

/**
 * Finds spots in a window of a single-channel signal image in which the marker is bright (dark markers
 * and colours are turned into such a signal first). Thresholds come from the window's own histogram, so
 * a global change of lighting does not matter: background B = a high percentile, contrast C = max − B;
 * spots are seeded above B + seed_share·C and grown (4-connected) over pixels above T = B + grow_share·C.
 * Each spot's position is the centroid weighted by the excess over T (sub-pixel; common practice, no source).
 * A spot with a pixel on the window's border (a background corner, a rim, a marker half outside) is left out.
 */
export function findSpots(signal: Uint8Array, width: number, win: Window, options: FindSpotsOptions = {}): { spots: Spot[]; contrast: number; noise: number } {
  const w = win.x1 - win.x0;
  const h = win.y1 - win.y0;
  if (w <= 2 || h <= 2) return { spots: [], contrast: 0, noise: 0 };
  const hist = scratch.hist.fill(0);
  const diffHist = scratch.diffHist.fill(0);
  let peak = 0;
  for (let y = win.y0; y < win.y1; y++) {
    const row = y * width;
    let prev = signal[row + win.x0];
    for (let x = win.x0; x < win.x1; x++) {
      const v = signal[row + x];
      hist[v]++;
      if (v > peak) peak = v;
      diffHist[Math.abs(v - prev)]++;
      prev = v;
    }
  }
  const n = w * h;
  const background = histogramQuantile(hist, n, options.background_percentile ?? 0.8);
  // Noise from neighbour differences: σ ≈ 1.4826·median|Δ|/√2 (robust; common practice, no source)
  const noise = Math.max(0.5, (1.4826 * histogramQuantile(diffHist, n, 0.5)) / Math.SQRT2);
  const contrast = peak - background;
  if (contrast < (options.min_contrast_noise ?? 8) * noise) return { spots: [], contrast, noise };
  const seed = background + (options.seed_share ?? 0.5) * contrast;
  const grow = background + (options.grow_share ?? 0.25) * contrast;
  const keepEdge = options.keep_edge_spots ?? false;
  if (scratch.visited.length < n) scratch.visited = new Uint8Array(n);
  const visited = scratch.visited.fill(0, 0, n);
  const stack = scratch.stack;
  stack.length = 0;
  const spots: Spot[] = [];
  for (let y = win.y0; y < win.y1; y++) {
    for (let x = win.x0; x < win.x1; x++) {
      const k = (y - win.y0) * w + (x - win.x0);
      if (visited[k] || signal[y * width + x] < seed) continue;
      let sw = 0;
      let sx = 0;
      let sy = 0;
      let area = 0;
      let top = 0;
      let onEdge = false;
      visited[k] = 1;
      stack.push(k);
      while (stack.length) {
        const q = stack.pop()!;
        const qx = (q % w) + win.x0;
        const qy = ((q / w) | 0) + win.y0;
        const v = signal[qy * width + qx];
        const wt = v - grow;
        sw += wt;
        sx += wt * qx;
        sy += wt * qy;
        area++;
        if (v > top) top = v;
        if (qx === win.x0 || qx === win.x1 - 1 || qy === win.y0 || qy === win.y1 - 1) onEdge = true;
        if (qx > win.x0 && !visited[q - 1] && signal[qy * width + qx - 1] > grow) { visited[q - 1] = 1; stack.push(q - 1); }
        if (qx < win.x1 - 1 && !visited[q + 1] && signal[qy * width + qx + 1] > grow) { visited[q + 1] = 1; stack.push(q + 1); }
        if (qy > win.y0 && !visited[q - w] && signal[(qy - 1) * width + qx] > grow) { visited[q - w] = 1; stack.push(q - w); }
        if (qy < win.y1 - 1 && !visited[q + w] && signal[(qy + 1) * width + qx] > grow) { visited[q + w] = 1; stack.push(q + w); }
      }
      if (onEdge && !keepEdge) continue;
      if (sw > 0) spots.push({ x_px: sx / sw, y_px: sy / sw, area_px: area, contrast: top - background, noise });
    }
  }
  spots.sort((a, b) => b.area_px - a.area_px);
  return { spots: spots.slice(0, options.max_spots ?? 16), contrast, noise };
}

function histogramQuantile(hist: Uint32Array, n: number, p: number): number {
  const target = p * n;
  let c = 0;
  for (let v = 0; v < 256; v++) {
    c += hist[v];
    if (c >= target) return v;
  }
  return 255;
}
