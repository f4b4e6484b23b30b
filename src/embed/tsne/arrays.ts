/**
 * Typed-array allocation on the ordinary heap or in shared memory (a
 * `SharedArrayBuffer`, readable by worker threads without a copy).
 */

/** Makes zero-filled arrays of a given length. */
export interface ArrayFactory {
  readonly shared: boolean;
  f64(length: number): Float64Array;
  i32(length: number): Int32Array;
}

/** Ordinary (unshared) arrays. */
export const heapArrays: ArrayFactory = {
  shared: false,
  f64: (length) => new Float64Array(length),
  i32: (length) => new Int32Array(length),
};

/** Arrays backed by a SharedArrayBuffer each. */
export const sharedArrays: ArrayFactory = {
  shared: true,
  f64: (length) => new Float64Array(new SharedArrayBuffer(8 * length)),
  i32: (length) => new Int32Array(new SharedArrayBuffer(4 * length)),
};

/** `a` itself when it already lives in shared memory, else a shared copy. */
export function sharedF64(a: Float64Array): Float64Array {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const b = sharedArrays.f64(a.length);
  b.set(a);
  return b;
}

/** `a` itself when it already lives in shared memory, else a shared copy. */
export function sharedI32(a: Int32Array): Int32Array {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const b = sharedArrays.i32(a.length);
  b.set(a);
  return b;
}
