/** Decimal places that show a spread (a standard error or an interval's half-width) to two significant digits, at most `most`; `fallback` when the spread is not a positive number. */
export function decimalsToShow(spread: number, most: number, fallback: number): number {
  if (!(spread > 0) || !Number.isFinite(spread)) return fallback;
  return Math.min(most, Math.max(0, 1 - Math.floor(Math.log10(spread))));
}
