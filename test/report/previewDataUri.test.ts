import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { previewDataUri } from '../../src/report/previewDataUri.js';

function pngOf(width: number, height: number, value: (x: number, y: number) => number): Uint8Array {
  const png = new PNG({ width, height });
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) {
    const i = 4 * (y * width + x);
    png.data[i] = png.data[i + 1] = png.data[i + 2] = value(x, y);
    png.data[i + 3] = 255;
  }
  return PNG.sync.write(png);
}

const decode = (uri: string) => PNG.sync.read(Buffer.from(uri.replace(/^data:image\/png;base64,/, ''), 'base64'));

describe('previewDataUri', () => {
  it('embeds a small frame unchanged', () => {
    const bytes = pngOf(64, 48, (x, y) => (x * 3 + y) % 256);
    const p = previewDataUri(bytes)!;
    expect(p.width).toBe(64);
    expect(Buffer.from(p.uri.split(',')[1]!, 'base64').equals(Buffer.from(bytes))).toBe(true);
  });

  it('shrinks a wide frame by averaging whole pixel blocks', () => {
    // 1200 px wide with a 560 px limit: 3×3 blocks (ceil(1200/560) = 3) → 400 × 10
    const p = previewDataUri(pngOf(1200, 30, (x, y) => (x % 3) * 30 + (y % 3) * 3), { max_width_px: 560 })!;
    expect([p.width, p.height]).toEqual([400, 10]);
    const img = decode(p.uri);
    // block mean of (x%3)*30 + (y%3)*3 over a 3×3 block = 30 + 3 = 33
    for (let i = 0; i < img.width * img.height; i++) expect(img.data[4 * i]).toBe(33);
  });

  it('returns null for bytes that are not a PNG', () => {
    expect(previewDataUri(new Uint8Array([1, 2, 3]))).toBeNull();
  });
});
