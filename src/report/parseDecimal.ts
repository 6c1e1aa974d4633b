const POW10 = Float64Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * Parses the decimal number in text[from, to) exactly as Number() would, without making a substring:
 * a fast path for [-+]digits[.digits] with at most 15 significant digits and 22 decimals (the digits form an
 * exact integer and 10^k is exact, so one division is correctly rounded — Clinger 1990); anything else
 * (exponents, long mantissas, NaN, junk) falls back to Number(). Empty or unparsable text gives NaN.
 */
export function parseDecimal(text: string, from: number, to: number): number {
  let i = from;
  while (i < to && text.charCodeAt(i) === 32) i++;
  let end = to;
  while (end > i && text.charCodeAt(end - 1) === 32) end--;
  if (i >= end) return Number.NaN;
  let negative = false;
  const c0 = text.charCodeAt(i);
  if (c0 === 45 || c0 === 43) {
    negative = c0 === 45;
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let decimals = 0;
  let seenDigit = false;
  let seenPoint = false;
  for (; i < end; i++) {
    const c = text.charCodeAt(i);
    if (c >= 48 && c <= 57) {
      seenDigit = true;
      if (mantissa !== 0 || c !== 48) digits++;
      mantissa = mantissa * 10 + (c - 48);
      if (seenPoint) decimals++;
    } else if (c === 46 && !seenPoint) seenPoint = true;
    else return slowPath(text, from, to);
  }
  if (!seenDigit || digits > 15 || decimals > 22) return slowPath(text, from, to);
  const value = decimals === 0 ? mantissa : mantissa / POW10[decimals]!;
  return negative ? -value : value;
}

function slowPath(text: string, from: number, to: number): number {
  const s = text.slice(from, to).trim();
  if (s === '') return Number.NaN;
  const v = Number(s);
  return Number.isFinite(v) ? v : Number.NaN;
}
