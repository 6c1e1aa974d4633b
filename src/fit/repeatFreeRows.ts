/**
 * Rows of an angle series that are not an exact repeat of the row before (the first of a run of equal values is
 * kept). A moving or noisy marker never repeats its angle to the last digit; a compressed video's still picture
 * does (the codec repeats the block), and such rows carry no measurement noise of their own.
 */
export function repeatFreeRows(angle_deg: ArrayLike<number>): number[] {
  const keep: number[] = [];
  for (let i = 0; i < angle_deg.length; i++) if (i === 0 || angle_deg[i] !== angle_deg[i - 1]) keep.push(i);
  return keep;
}
