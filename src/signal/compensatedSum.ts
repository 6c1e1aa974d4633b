/**
 * Sum of squares Σ v² with Neumaier's compensated summation (Neumaier 1974, an improved Kahan sum):
 * the rounding error of each addition is carried along, so hour-long series sum to full precision.
 */
export function compensatedSumOfSquares(values: ArrayLike<number>, start = 0, end = values.length): number {
  let sum = 0;
  let carry = 0;
  for (let i = start; i < end; i++) {
    const v = values[i]! * values[i]!;
    const s = sum + v;
    carry += sum >= v ? sum - s + v : v - s + sum;
    sum = s;
  }
  return sum + carry;
}
