/**
 * Fresh zero-filled typed arrays for the engine's per-structure work, cut from large shared
 * blocks. A new Float64Array or Int32Array of a few hundred bytes costs V8 a separate backing
 * store (measured here at 2–3 µs each on Node 20, against ~30 ns for a view on an existing
 * buffer), and perception makes dozens per structure. A block is never handed out twice, so
 * every array is zeroed like `new Float64Array(n)`; a block is freed by the garbage collector
 * once no array cut from it is alive.
 *
 * The arrays share their `.buffer`: do not post them to another thread or wrap their buffer
 * (results leave the engine as plain arrays).
 *
 * Blocks are 64 KiB, below the C allocator's threshold for giving a request its own memory
 * mapping (128 KiB): a freed block's memory is then handed out again, already paged in. With
 * 1 MiB blocks every block was fresh memory, and on the development machine (a virtual machine
 * where a page fault costs about 18 µs) the 5,000-structure bench file took ~11,000 more page
 * faults, about a tenth of its run time (DEVELOPERS.md, "Keeping the engine fast").
 */

/** Size of one block (bytes). Larger requests get their own typed array. */
const BLOCK_BYTES = 1 << 16;

let f64Block = new Float64Array(0);
let f64Next = 0;
let i32Block = new Int32Array(0);
let i32Next = 0;
let u8Block = new Uint8Array(0);
let u8Next = 0;

/** A zeroed Float64Array of length n. */
export function f64(n: number): Float64Array {
  if (n > BLOCK_BYTES / 64) return new Float64Array(n);
  if (f64Next + n > f64Block.length) {
    f64Block = new Float64Array(BLOCK_BYTES / 8);
    f64Next = 0;
  }
  const out = f64Block.subarray(f64Next, f64Next + n);
  f64Next += n;
  return out;
}

/** A zeroed Int32Array of length n. */
export function i32(n: number): Int32Array {
  if (n > BLOCK_BYTES / 64) return new Int32Array(n);
  if (i32Next + n > i32Block.length) {
    i32Block = new Int32Array(BLOCK_BYTES / 4);
    i32Next = 0;
  }
  const out = i32Block.subarray(i32Next, i32Next + n);
  i32Next += n;
  return out;
}

/** A zeroed Uint8Array of length n. */
export function u8(n: number): Uint8Array {
  if (n > BLOCK_BYTES / 64) return new Uint8Array(n);
  if (u8Next + n > u8Block.length) {
    u8Block = new Uint8Array(BLOCK_BYTES);
    u8Next = 0;
  }
  const out = u8Block.subarray(u8Next, u8Next + n);
  u8Next += n;
  return out;
}

/** A copy of `a` from the arena (like `a.slice()`). */
export function copyF64(a: ArrayLike<number>): Float64Array {
  const out = f64(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i];
  return out;
}

/** A copy of `a` from the arena (like `a.slice()`). */
export function copyI32(a: ArrayLike<number>): Int32Array {
  const out = i32(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i];
  return out;
}
