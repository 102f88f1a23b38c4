/**
 * A small pool of module workers behind comlink.
 * - Sized to the machine (navigator.hardwareConcurrency, at least 1); size 0 runs every call inline on the
 *   calling thread with the same API (tests, Node).
 * - Each job belongs to a channel ("evaluate", "point", …) and carries a generation number. Submitting a
 *   newer generation on a channel drops the older queued jobs and marks running ones stale; a stale
 *   result is never delivered (the promise rejects with a StaleResultError).
 * - A worker that dies (error event, or a failed call that is not an ordinary thrown error) is replaced,
 *   its job rejects with a WorkerCrashError and `onCrash` tells the user.
 * - Typed arrays go through `transfer` lists: the caller names what to move.
 */
import * as Comlink from "comlink";

/** Thrown (rejected) for a job superseded by a newer generation on its channel. */
export class StaleResultError extends Error {
  override name = "StaleResultError";
}

/** Thrown (rejected) when the worker running a job died. */
export class WorkerCrashError extends Error {
  override name = "WorkerCrashError";
}

export function isStale(err: unknown): boolean {
  return err instanceof Error && err.name === "StaleResultError";
}

export interface PoolOptions<Api> {
  /** Number of workers; 0 runs inline. */
  size: number;
  /** Creates one module worker (only called when size > 0). */
  createWorker?: () => Worker;
  /** The API implementation for inline mode (size 0). */
  inline?: Api;
  /** Told when a worker crashed and was replaced. */
  onCrash?: (message: string) => void;
  /**
   * Told when a newer generation of a channel is submitted while a worker runs an older one, so that
   * the worker can stop it early (its reply would be dropped as stale anyway).
   */
  onSuperseded?: (remote: Comlink.Remote<Api>, channel: string, generation: number) => void;
}

type AnyFn = (...args: never[]) => unknown;
type Methods<Api> = { [K in keyof Api]: Api[K] extends AnyFn ? K : never }[keyof Api];

interface Job<Api> {
  channel: string;
  generation: number;
  method: Methods<Api>;
  args: unknown[];
  transfer: Transferable[];
  /** Worker index this job must run on (its caches live there); any free worker when undefined. */
  slot: number | undefined;
  resolve: (v: unknown) => void;
  reject: (e: unknown) => void;
}

export interface RunOptions {
  /** Typed-array buffers to move to the worker. */
  transfer?: Transferable[];
  /** Run on this worker (modulo the pool size), e.g. to reuse a cache kept there. */
  slot?: number;
}

interface Slot<Api> {
  worker: Worker;
  remote: Comlink.Remote<Api>;
  job: Job<Api> | null;
}

/** Default pool size for this machine: one worker per logical core. */
export function defaultPoolSize(): number {
  const n = typeof navigator !== "undefined" ? navigator.hardwareConcurrency : 1;
  return Number.isFinite(n) && n > 0 ? Math.floor(n) : 1;
}

export class WorkerPool<Api extends object> {
  private readonly slots: Slot<Api>[] = [];
  private readonly queue: Job<Api>[] = [];
  private readonly latest = new Map<string, number>();
  private readonly options: PoolOptions<Api>;
  private closed = false;

  constructor(options: PoolOptions<Api>) {
    this.options = options;
    if (options.size > 0 && !options.createWorker) throw new Error("a worker pool needs createWorker");
    if (options.size === 0 && !options.inline) throw new Error("an inline pool needs an API implementation");
    for (let i = 0; i < options.size; i++) this.slots.push(this.spawn());
  }

  get size(): number {
    return this.slots.length;
  }

  /**
   * Calls `f` with every worker's remote (or the inline API), outside the job queue: for notices that
   * need no reply and must not wait behind jobs.
   */
  notifyAll(f: (api: Comlink.Remote<Api> | Api) => Promise<unknown> | unknown): void {
    const targets: (Comlink.Remote<Api> | Api)[] =
      this.options.size === 0 ? [this.options.inline as Api] : this.slots.map((s) => s.remote);
    for (const t of targets) {
      try {
        void Promise.resolve(f(t)).catch(() => undefined);
      } catch {
        // A notice to a worker that cannot take it (closed, being replaced) is dropped.
      }
    }
  }

  /** The newest generation submitted on a channel (0 when none). */
  latestGeneration(channel: string): number {
    return this.latest.get(channel) ?? 0;
  }

  /** Runs `method(...args)` as generation `generation` of `channel`; older work on the channel is dropped. */
  run<M extends Methods<Api>>(
    channel: string,
    generation: number,
    method: M,
    args: Api[M] extends (...a: infer A) => unknown ? A : never,
    options: RunOptions = {},
  ): Promise<Api[M] extends (...a: never[]) => infer R ? Awaited<R> : never> {
    if (this.closed) return Promise.reject(new Error("the worker pool is closed"));
    const prev = this.latest.get(channel) ?? 0;
    if (generation < prev) return Promise.reject(new StaleResultError(`generation ${generation} < ${prev}`));
    this.latest.set(channel, generation);
    // Tell workers running older work of the channel, then drop queued older work.
    for (const slot of this.slots) {
      const j = slot.job;
      if (j && j.channel === channel && j.generation < generation)
        this.options.onSuperseded?.(slot.remote, channel, generation);
    }
    for (let i = this.queue.length - 1; i >= 0; i--) {
      const q = this.queue[i];
      if (q.channel === channel && q.generation < generation) {
        this.queue.splice(i, 1);
        q.reject(new StaleResultError(`superseded by generation ${generation}`));
      }
    }
    return new Promise((resolve, reject) => {
      const job: Job<Api> = {
        channel,
        generation,
        method,
        args: args as unknown[],
        transfer: options.transfer ?? [],
        slot:
          options.slot === undefined || this.slots.length === 0
            ? undefined
            : options.slot % this.slots.length,
        resolve: resolve as (v: unknown) => void,
        reject,
      };
      if (this.options.size === 0) this.runInline(job);
      else {
        this.queue.push(job);
        this.pump();
      }
    });
  }

  /** Terminates every worker; pending jobs reject. */
  close(): void {
    this.closed = true;
    for (const q of this.queue.splice(0)) q.reject(new Error("the worker pool is closed"));
    for (const s of this.slots) {
      s.job?.reject(new Error("the worker pool is closed"));
      s.remote[Comlink.releaseProxy]();
      s.worker.terminate();
    }
    this.slots.length = 0;
  }

  private isStale(job: Job<Api>): boolean {
    return job.generation < (this.latest.get(job.channel) ?? 0);
  }

  private async runInline(job: Job<Api>): Promise<void> {
    const api = this.options.inline as Api;
    try {
      const fn = api[job.method] as unknown as (...a: unknown[]) => unknown;
      const value = await fn.apply(api, job.args);
      if (this.isStale(job)) job.reject(new StaleResultError("superseded while running"));
      else job.resolve(value);
    } catch (err) {
      job.reject(err);
    }
  }

  private spawn(): Slot<Api> {
    const worker = (this.options.createWorker as () => Worker)();
    const slot: Slot<Api> = { worker, remote: Comlink.wrap<Api>(worker), job: null };
    const onDeath = (ev: Event) => {
      const detail = ev instanceof ErrorEvent && ev.message ? ev.message : "the worker stopped unexpectedly";
      this.replace(slot, detail);
    };
    worker.addEventListener("error", onDeath);
    worker.addEventListener("messageerror", onDeath);
    return slot;
  }

  private replace(slot: Slot<Api>, detail: string): void {
    const i = this.slots.indexOf(slot);
    if (i < 0 || this.closed) return;
    slot.worker.terminate();
    const job = slot.job;
    slot.job = null;
    this.slots[i] = this.spawn();
    job?.reject(new WorkerCrashError(`a coverage worker crashed (${detail}); it was restarted`));
    this.options.onCrash?.(`A coverage worker crashed (${detail}). It was restarted; the plan is intact.`);
    this.pump();
  }

  private pump(): void {
    this.slots.forEach((slot, index) => {
      if (slot.job) return;
      const k = this.queue.findIndex((j) => j.slot === undefined || j.slot === index);
      if (k < 0) return;
      const [job] = this.queue.splice(k, 1);
      this.start(slot, job);
    });
  }

  private async start(slot: Slot<Api>, job: Job<Api>): Promise<void> {
    slot.job = job;
    try {
      const fn = slot.remote[job.method as keyof Comlink.Remote<Api>] as unknown as (
        ...a: unknown[]
      ) => Promise<unknown>;
      const args = job.args.map((a, k) =>
        k === 0 && job.transfer.length ? Comlink.transfer(a, job.transfer) : a,
      );
      const value = await fn(...args);
      if (slot.job !== job) return; // crashed and replaced meanwhile
      slot.job = null;
      if (this.isStale(job)) job.reject(new StaleResultError("superseded while running"));
      else job.resolve(value);
    } catch (err) {
      if (slot.job !== job) return;
      slot.job = null;
      // A run stopped because it was superseded is stale, not an error.
      job.reject(this.isStale(job) ? new StaleResultError("superseded while running") : err);
    } finally {
      this.pump();
    }
  }
}
