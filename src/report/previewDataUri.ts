import { PNG } from 'pngjs';

export interface PreviewOptions {
  /** Largest width kept, px; wider frames are shrunk by an integer box filter. Default 560. */
  max_width_px?: number;
}

/**
 * The preview frame as a data: URI (PNG), shrunk by averaging k×k pixel blocks when wider than max_width_px
 * so that a day of runs keeps the report small. Returns null when the bytes are not a readable PNG.
 */
export function previewDataUri(png: Uint8Array, options: PreviewOptions = {}): { uri: string; width: number; height: number; original_width: number } | null {
  const maxWidth = options.max_width_px ?? 560;
  let image: PNG;
  try {
    image = PNG.sync.read(Buffer.from(png));
  } catch {
    return null;
  }
  const k = Math.ceil(image.width / maxWidth);
  if (k <= 1) return { uri: `data:image/png;base64,${Buffer.from(png).toString('base64')}`, width: image.width, height: image.height, original_width: image.width };
  const w = Math.floor(image.width / k);
  const h = Math.floor(image.height / k);
  const out = new PNG({ width: w, height: h });
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      for (let c = 0; c < 4; c++) {
        let sum = 0;
        for (let dy = 0; dy < k; dy++) for (let dx = 0; dx < k; dx++) sum += image.data[((y * k + dy) * image.width + x * k + dx) * 4 + c]!;
        out.data[(y * w + x) * 4 + c] = Math.round(sum / (k * k));
      }
    }
  }
  // RGB without alpha (a video frame has none) and one fixed filter: smaller and faster than pngjs's defaults
  const bytes = PNG.sync.write(out, { colorType: 2, inputHasAlpha: true, filterType: 4 });
  return { uri: `data:image/png;base64,${bytes.toString('base64')}`, width: w, height: h, original_width: image.width };
}
