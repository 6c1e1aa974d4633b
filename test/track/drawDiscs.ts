// Test helper: drawn 200×200 images with bright discs at known places (truth for follower specs).

/** Side of the drawn images, px. */
export const DRAWN_SIZE = 200;

/** A 200×200 image: background 60 with a deterministic ±3 ripple, and bright discs (200) of radius r px at the given centres, edge pixels by 4×4 coverage. */
export function drawDiscs(discs: readonly { x: number; y: number; r: number }[]): Uint8Array {
  const img = new Uint8Array(DRAWN_SIZE * DRAWN_SIZE);
  for (let j = 0; j < DRAWN_SIZE; j++) {
    for (let i = 0; i < DRAWN_SIZE; i++) {
      let cover = 0;
      const near = discs.filter((d) => Math.abs(i - d.x) <= d.r + 1 && Math.abs(j - d.y) <= d.r + 1);
      if (near.length > 0) for (let sy = 0; sy < 4; sy++) for (let sx = 0; sx < 4; sx++) if (near.some((d) => Math.hypot(i - 0.375 + sx / 4 - d.x, j - 0.375 + sy / 4 - d.y) <= d.r)) cover++;
      img[j * DRAWN_SIZE + i] = Math.round(60 + 3 * Math.sin(1.3 * i + 2.1 * j) + (140 * cover) / 16);
    }
  }
  return img;
}
