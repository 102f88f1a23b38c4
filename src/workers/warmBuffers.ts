/**
 * Memory made ready while a worker is idle. New memory costs its first write (page faults: about 1 ms
 * per MB in a Chromium worker and in Node on the project machine, measured by writing a new 16 MB
 * Float32Array twice: 12–27 ms the first time, under 2 ms the second). A release after a drag needs
 * tens of MB at once (the moved radar's result, the copies of the fused slices it sends), so the
 * worker writes such arrays once in its idle time, one array per turn of the event loop, and a run
 * takes them ready.
 */
import { yieldToEventLoop } from "../coverage/evaluate";

type Buffer = Float32Array | Uint8Array;
/** The element types a pool holds. */
export type BufferKind = "f32" | "u8";

function keyOf(kind: BufferKind, length: number): string {
  return `${kind}:${length}`;
}

function kindOf(a: Buffer): string {
  return keyOf(a instanceof Float32Array ? "f32" : "u8", a.length);
}

/** A new array of this kind and length. */
export function newBuffer(kind: BufferKind, length: number): Buffer {
  return kind === "f32" ? new Float32Array(length) : new Uint8Array(length);
}

/** Typed arrays of given kinds and lengths, written through once, waiting to be taken. */
export class WarmBuffers {
  private readonly pool = new Map<string, Buffer[]>();
  constructor(readonly maxPerKind = 8) {}

  /** A ready array of this kind and length (its contents are arbitrary), or undefined. */
  take<T extends Buffer>(like: T): T | undefined {
    return this.pool.get(kindOf(like))?.pop() as T | undefined;
  }

  /** Ready arrays of this kind and length. */
  count(kind: BufferKind, length: number): number {
    return this.pool.get(keyOf(kind, length))?.length ?? 0;
  }

  /** A copy of `a` in a ready array when there is one, else in a new one. */
  copy<T extends Buffer>(a: T): T {
    const out = this.take(a);
    if (out === undefined) return a.slice() as T;
    out.set(a);
    return out;
  }

  put(a: Buffer): void {
    const k = kindOf(a);
    const list = this.pool.get(k) ?? [];
    if (list.length < this.maxPerKind) list.push(a);
    this.pool.set(k, list);
  }

  clear(): void {
    this.pool.clear();
  }
}

/**
 * Writes every page of each array, one array per turn of the event loop (so a request that arrives
 * meanwhile is served between two arrays), `pauseMs` apart when given. Stops early, returning false,
 * once `stop()` says so.
 *
 * The pause is for the page: on a machine of two cores, two workers writing their memory back to back
 * leave the page's main thread waiting for a core (a 17–25 ms task of the page took 60–68 ms on the
 * first drag after opening a 1 M-cell plan, docs/performance.md). A 4 MB array takes about 4 ms to
 * write, so a pause of 25 ms keeps a worker's idle work to about a seventh of a core.
 */
export async function writeThrough(
  arrays: readonly Buffer[],
  stop: () => boolean,
  pauseMs = 0,
): Promise<boolean> {
  for (const a of arrays) {
    await (pauseMs > 0 ? sleep(pauseMs) : yieldToEventLoop());
    if (stop()) return false;
    a.fill(0);
  }
  return true;
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}
