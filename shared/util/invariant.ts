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

/**
 * The item a hot loop read itself as `list[index]`, checked: throws like itemAt when the read
 * found nothing (the index was outside the list). For lists whose items are never undefined
 * (numbers, typed arrays, records). The read stays in the caller's code, where the engine
 * specialises it for that one kind of list; itemAt's single read sees every kind of list in the
 * program (numbers, records, typed arrays) and falls back to a generic lookup, which doubled the
 * core solve of 200 facets when its facet loop went through itemAt (`npm run bench`).
 */
export function present<T>(item: T | undefined, index: number, list: ArrayLike<unknown>): T {
  // `typeof` rather than `=== undefined`: on a list of numbers with holes (new Array(n)) the
  // engine tests the hole directly instead of first turning every number into an object
  // (measured 3× faster). The throw lives in its own function so that this body stays small
  // enough to be inlined at every call site.
  if (typeof item === 'undefined') outsideTheList(index, list.length);
  return item;
}

function outsideTheList(index: number, length: number): never {
  throw new Error(`Invariant broken: index ${index} outside a list of ${length}`);
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
