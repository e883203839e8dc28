/**
 * Checked indexing for code compiled with `noUncheckedIndexedAccess`: an index the caller has
 * proven in range (a loop bound, a modulo of the length, a length checked just above) is read
 * through these, so a broken proof throws an error naming the index and the length instead of
 * passing `undefined` on into arithmetic (where it becomes NaN far from the cause).
 */

/** Throws `Error('Invariant broken: …')` when `condition` is false (a programmer error, never bad input). */
export function invariant(condition: unknown, message: string): asserts condition {
  if (!condition) throw new Error(`Invariant broken: ${message}`);
}

/**
 * The item at `index` of `list`; negative indices count from the end, as `Array.prototype.at`.
 * Throws when the index is outside the list (or not an integer).
 */
export function itemAt<T>(list: ArrayLike<T>, index: number): T {
  const i = index < 0 ? list.length + index : index;
  if (!Number.isInteger(i) || i < 0 || i >= list.length) {
    throw new Error(`Invariant broken: index ${index} outside a list of ${list.length}`);
  }
  // In range, so the read is an item of type T (which may itself include undefined).
  return list[i] as T;
}

/** The first item of a list the caller knows is not empty. */
export function firstItem<T>(list: ArrayLike<T>): T {
  return itemAt(list, 0);
}

/** The last item of a list the caller knows is not empty. */
export function lastItem<T>(list: ArrayLike<T>): T {
  return itemAt(list, -1);
}

/** The item at `index` of a closed polygon's vertex list, wrapping around both ends. */
export function cyclicItem<T>(list: ArrayLike<T>, index: number): T {
  const n = list.length;
  return itemAt(list, ((index % n) + n) % n);
}

/** A tuple of `N` items of type T (N a small literal). */
export type Tuple<T, N extends number, Acc extends T[] = []> = Acc['length'] extends N ? Acc : Tuple<T, N, [...Acc, T]>;

/** The first `n` items of a list as a tuple, for destructuring; throws when the list is shorter. */
export function firstItems<T, N extends number>(list: readonly T[], n: N): Tuple<T, N> {
  if (list.length < n) throw new Error(`Invariant broken: ${n} items needed, the list has ${list.length}`);
  // Checked just above: the slice has exactly n items.
  return list.slice(0, n) as Tuple<T, N>;
}
