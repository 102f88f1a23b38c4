/**
 * Per-radar result cache. A radar's coverage depends only on its model, its post (position, antenna
 * height, boresight, tilt), the terrain surfaces, the target heights and classes, the detection
 * requirement and the analysis settings. The key is a hash of exactly those, so moving or retuning one
 * radar changes one key and recomputes one radar.
 */

/**
 * A stable text form of a JSON-like value: object keys sorted, typed arrays as plain lists, NaN and
 * ±Infinity spelled out (JSON would turn them into null and make different inputs collide).
 */
export function stableStringify(value: unknown): string {
  if (value === null || value === undefined) return "null";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : `"${String(value)}"`;
  if (typeof value === "string") return JSON.stringify(value);
  if (typeof value === "boolean") return value ? "true" : "false";
  if (ArrayBuffer.isView(value)) return `[${Array.from(value as unknown as ArrayLike<number>).join(",")}]`;
  if (Array.isArray(value)) return `[${value.map(stableStringify).join(",")}]`;
  if (typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined && typeof v !== "function")
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${stableStringify(v)}`).join(",")}}`;
  }
  return JSON.stringify(String(value));
}

/** 53-bit string hash (cyrb53 construction, two Math.imul lanes), as 14 hex digits. */
function hash53(text: string, seed: number): string {
  let h1 = 0xdeadbeef ^ seed;
  let h2 = 0x41c6ce57 ^ seed;
  for (let i = 0; i < text.length; i++) {
    const ch = text.charCodeAt(i);
    h1 = Math.imul(h1 ^ ch, 2654435761);
    h2 = Math.imul(h2 ^ ch, 1597334677);
  }
  h1 = Math.imul(h1 ^ (h1 >>> 16), 2246822507) ^ Math.imul(h2 ^ (h2 >>> 13), 3266489909);
  h2 = Math.imul(h2 ^ (h2 >>> 16), 2246822507) ^ Math.imul(h1 ^ (h1 >>> 13), 3266489909);
  const value = 4294967296 * (2097151 & h2) + (h1 >>> 0);
  return value.toString(16).padStart(14, "0");
}

/** A 106-bit hash (two seeded 53-bit lanes) of the stable text form of `value`, as 28 hex digits. */
export function hashValue(value: unknown): string {
  const text = stableStringify(value);
  return hash53(text, 1) + hash53(text, 2);
}

/**
 * Identity of a raster's contents: a 64-bit FNV-1a-style hash over its bytes taken as 32-bit words,
 * plus its length. Hashing 4 M cells takes a few milliseconds, far less than one radar's evaluation.
 */
export function hashRaster(data: Float32Array | Uint8Array): string {
  const words =
    data.byteLength % 4 === 0
      ? new Uint32Array(data.buffer, data.byteOffset, data.byteLength / 4)
      : new Uint32Array(Uint8Array.from(data).buffer.slice(0, data.byteLength - (data.byteLength % 4)));
  let h1 = 0x811c9dc5;
  let h2 = 0x01000193 ^ data.length;
  for (let i = 0; i < words.length; i++) {
    const w = words[i];
    h1 = Math.imul(h1 ^ w, 16777619);
    h2 = Math.imul(h2 ^ (w >>> 7) ^ (w << 25), 2246822519);
  }
  // Bytes that do not fill a whole word.
  for (let i = words.length * 4; i < data.byteLength; i++) {
    const b = new Uint8Array(data.buffer, data.byteOffset + i, 1)[0];
    h1 = Math.imul(h1 ^ b, 16777619);
  }
  return `${(h1 >>> 0).toString(16).padStart(8, "0")}${(h2 >>> 0).toString(16).padStart(8, "0")}-${data.length}`;
}

/** Everything one radar's result depends on; the cache key is the hash of this record. */
export interface RadarKeyParts {
  /** The radar model (the full record, so editing any field changes the key). */
  model: unknown;
  /** The placed radar: position in grid metres, antenna height ASL, boresight, tilt. */
  placement: unknown;
  /** Identity of the ground, surface and obstruction-top rasters and the grid frame. */
  terrainId: string;
  heightsAglM: ReadonlyArray<number>;
  /** Target classes (RCS, Swerling case, …). */
  targets: unknown;
  /** Requirement and settings that reach the per-radar stage (Pd, Pfa, looks, k, mask mode, losses). */
  settings: unknown;
}

/** The cache key of one radar's result. */
export function radarResultKey(parts: RadarKeyParts): string {
  return hashValue(parts);
}

/** Options of a RadarResultCache. */
export interface RadarResultCacheOptions {
  /**
   * At most this many entries per group (set's `group`, e.g. one radar): a radar moved again and again
   * keeps its newest results (undo, redo) and lets older ones go. Default: no limit.
   */
  perGroup?: number;
  /**
   * Entries that left (over a bound) are kept as spares, at most this many (default 0): a caller takes
   * one with takeSpare() and writes a new result into its arrays instead of allocating new ones (fresh
   * memory costs its page faults, about 1 ms per MB on the project machine).
   */
  spares?: number;
}

/**
 * A bounded map from radar keys to results, least recently used first out.
 * `computed` and `hits` count what happened, so callers and tests can see what was recomputed.
 */
export class RadarResultCache<T> {
  private readonly entries = new Map<string, { value: T; group: string | undefined }>();
  /**
   * The result computed ahead (setAhead), apart from the entries until a run asks for it. One at a
   * time: a place rested on and left is not where a later release lands, and the run's memory estimate
   * (siteGrid.ts EXTRA_RADAR_RESULTS) counts one.
   */
  private ahead: { key: string; value: T; group: string } | null = null;
  private readonly spareValues: T[] = [];
  hits = 0;
  computed = 0;
  constructor(
    readonly maxEntries = 64,
    private readonly options: RadarResultCacheOptions = {},
  ) {}

  get size(): number {
    return this.entries.size;
  }

  /**
   * The cached result for `key`, marking it recently used; undefined when absent. A result computed
   * ahead under this key becomes an entry of its group now, as if just computed.
   */
  get(key: string): T | undefined {
    const entry = this.entries.get(key);
    if (entry === undefined) {
      const a = this.ahead;
      if (a === null || a.key !== key) return undefined;
      this.ahead = null;
      this.set(key, a.value, a.group);
      return a.value;
    }
    this.entries.delete(key);
    this.entries.set(key, entry);
    return entry.value;
  }

  has(key: string): boolean {
    return this.entries.has(key) || this.ahead?.key === key;
  }

  /**
   * Keeps a result computed ahead of need (a release computed while a dragged post rests) apart from
   * the entries, so that positions passed on the way do not push the group's kept results (undo) out;
   * get() takes it in when asked. The one computed ahead before becomes a spare. A result of a group
   * with no entry yet pushes no kept result of its own out: it becomes an entry at once.
   */
  setAhead(key: string, value: T, group: string): void {
    if (this.entries.has(key)) return;
    if (this.inGroup(group) === 0) {
      this.set(key, value, group);
      return;
    }
    const old = this.ahead;
    if (old !== null && old.value !== value) this.retire(old.value);
    this.ahead = { key, value, group };
  }

  /**
   * Store `value` under `key` (in `group`, see RadarResultCacheOptions.perGroup). Entries that leave
   * become spares; a value that is in use elsewhere must not be stored twice.
   */
  set(key: string, value: T, group?: string): void {
    const old = this.entries.get(key);
    this.entries.delete(key);
    if (old !== undefined && old.value !== value) this.retire(old.value);
    this.entries.set(key, { value, group });
    const perGroup = this.options.perGroup;
    if (group !== undefined && perGroup !== undefined) {
      let inGroup = this.inGroup(group);
      // Oldest first: the map keeps insertion (use) order.
      for (const [k, e] of this.entries) {
        if (inGroup <= perGroup) break;
        if (e.group !== group) continue;
        this.entries.delete(k);
        this.retire(e.value);
        inGroup--;
      }
    }
    while (this.entries.size > this.maxEntries) {
      const [oldest, e] = this.entries.entries().next().value as [string, { value: T }];
      this.entries.delete(oldest);
      this.retire(e.value);
    }
  }

  /** Entries of `group`. */
  private inGroup(group: string): number {
    let n = 0;
    for (const e of this.entries.values()) if (e.group === group) n++;
    return n;
  }

  /**
   * A result that has left the cache, for its arrays to be overwritten (the newest first), or
   * undefined. Entries leave only when newer ones come in, so a spare is never one a run in progress
   * has just taken from the cache: the cache holds more entries than a site has radars.
   */
  takeSpare(): T | undefined {
    return this.spareValues.pop();
  }

  /** Spares held now. */
  get spareCount(): number {
    return this.spareValues.length;
  }

  /** Adds a value made ready elsewhere (e.g. memory prepared while idle) to the spares. */
  addSpare(value: T): void {
    this.retire(value);
  }

  private retire(value: T): void {
    const max = this.options.spares ?? 0;
    if (max === 0) return;
    this.spareValues.push(value);
    if (this.spareValues.length > max) this.spareValues.shift();
  }

  /** The cached value, or compute, store and return it (counting hits and computations). */
  async getOrCompute(key: string, compute: () => T | Promise<T>): Promise<T> {
    const cached = this.get(key);
    if (cached !== undefined) {
      this.hits++;
      return cached;
    }
    const value = await compute();
    this.computed++;
    this.set(key, value);
    return value;
  }

  clear(): void {
    this.entries.clear();
    this.ahead = null;
    this.spareValues.length = 0;
  }
}
