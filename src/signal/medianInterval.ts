/**
 * Median of the intervals t[i] − t[i−1] of increasing times, s (Hoare's selection, expected O(n), on a copy).
 * The typical frame interval of a series with jitter and dropped frames.
 */
export function medianInterval(t_s: ArrayLike<number>): number {
  const n = t_s.length - 1;
  if (n < 1) return Number.NaN;
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) a[i] = t_s[i + 1]! - t_s[i]!;
  const k = Math.floor((n - 1) / 2);
  let lo = 0;
  let hi = n - 1;
  while (lo < hi) {
    const pivot = a[(lo + hi) >> 1]!;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const tmp = a[i]!;
        a[i] = a[j]!;
        a[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return a[k]!;
}
