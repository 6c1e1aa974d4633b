/** A typed array of the same kind and twice the length, holding `arr`'s values at the start (a growable column's next buffer). */
export function doubleCapacity<T extends Float64Array | Int32Array>(arr: T): T {
  const next = new (arr.constructor as new (n: number) => T)(arr.length * 2);
  next.set(arr);
  return next;
}
