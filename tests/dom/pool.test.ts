// @vitest-environment jsdom
import * as Comlink from "comlink";
import { describe, expect, it } from "vitest";
import { isStale, WorkerPool } from "../../src/workers/pool";

interface Api {
  echo(x: number, delayMs: number): Promise<number>;
  sum(a: Float32Array): Promise<number>;
  whoami(): Promise<number>;
}

let workerCounter = 0;

function makeApi(id: number): Api {
  return {
    echo: (x, delayMs) => new Promise((r) => setTimeout(() => r(x), delayMs)),
    sum: async (a) => a.reduce((s, v) => s + v, 0),
    whoami: async () => id,
  };
}

/** A stand-in for a module worker: a MessageChannel with the API exposed on the far end. */
class FakeWorker {
  readonly id = ++workerCounter;
  private readonly port: MessagePort;
  private readonly errorListeners: ((e: Event) => void)[] = [];
  terminated = false;
  constructor() {
    const ch = new MessageChannel();
    this.port = ch.port1;
    Comlink.expose(makeApi(this.id), ch.port2);
  }
  postMessage(msg: unknown, transfer?: Transferable[]) {
    this.port.postMessage(msg, transfer ?? []);
  }
  addEventListener(type: string, fn: (e: Event) => void) {
    if (type === "error") this.errorListeners.push(fn);
    else if (type === "message") this.port.addEventListener("message", fn as (e: MessageEvent) => void);
    this.port.start();
  }
  removeEventListener(type: string, fn: (e: Event) => void) {
    if (type === "message") this.port.removeEventListener("message", fn as (e: MessageEvent) => void);
  }
  terminate() {
    this.terminated = true;
    this.port.close();
  }
  crash() {
    for (const fn of this.errorListeners) fn(new ErrorEvent("error", { message: "boom" }));
  }
}

/** A worker factory that keeps every fake worker it makes, in order. */
function recordedWorkers(): { workers: FakeWorker[]; createWorker: () => Worker } {
  const workers: FakeWorker[] = [];
  const createWorker = () => {
    const w = new FakeWorker();
    workers.push(w);
    return w as unknown as Worker;
  };
  return { workers, createWorker };
}

describe("worker pool", () => {
  it("runs inline with pool size 0 and drops stale generations", async () => {
    const pool = new WorkerPool<Api>({ size: 0, inline: makeApi(0) });
    const older = pool.run("eval", 1, "echo", [1, 30]);
    const newer = pool.run("eval", 2, "echo", [2, 1]);
    await expect(newer).resolves.toBe(2);
    await expect(older).rejects.toSatisfy(isStale);
    await expect(pool.run("eval", 1, "echo", [3, 0])).rejects.toSatisfy(isStale);
    // Other channels are independent.
    await expect(pool.run("point", 1, "echo", [4, 0])).resolves.toBe(4);
  });

  it("drops queued older work on a channel and keeps the newest", async () => {
    const { createWorker } = recordedWorkers();
    const pool = new WorkerPool<Api>({
      size: 1,
      createWorker,
    });
    const busy = pool.run("a", 1, "echo", [1, 40]);
    const queued = pool.run("b", 1, "echo", [2, 0]);
    const q2 = pool.run("b", 2, "echo", [3, 0]);
    await expect(queued).rejects.toSatisfy(isStale);
    await expect(busy).resolves.toBe(1);
    await expect(q2).resolves.toBe(3);
    pool.close();
  });

  it("keeps jobs on their slot and transfers typed arrays", async () => {
    const pool = new WorkerPool<Api>({ size: 2, createWorker: () => new FakeWorker() as unknown as Worker });
    const a = await pool.run("x", 1, "whoami", [], { slot: 0 });
    const b = await pool.run("x", 2, "whoami", [], { slot: 0 });
    expect(a).toBe(b);
    const c = await pool.run("y", 1, "whoami", [], { slot: 1 });
    expect(c).not.toBe(a);
    const arr = new Float32Array([1, 2, 3.5]);
    await expect(pool.run("s", 1, "sum", [arr], { transfer: [arr.buffer] })).resolves.toBe(6.5);
    expect(arr.byteLength).toBe(0); // moved, not copied
    pool.close();
  });

  it("notifies every worker outside the job queue, and drops a notice that fails", async () => {
    const pool = new WorkerPool<Api>({ size: 2, createWorker: () => new FakeWorker() as unknown as Worker });
    // Worker 0 is busy for a while; a notice reaches it at once, not after its job.
    let busyDone = false;
    const busy = pool.run("x", 1, "echo", [1, 1000], { slot: 0 }).finally(() => {
      busyDone = true;
    });
    const heard: number[] = [];
    pool.notifyAll(async (api) => {
      heard.push(await api.whoami());
    });
    pool.notifyAll(() => {
      throw new Error("a worker being replaced");
    });
    pool.notifyAll(() => Promise.reject(new Error("closed")));
    await expect.poll(() => heard.length).toBe(2);
    expect(busyDone).toBe(false);
    expect(new Set(heard).size).toBe(2);
    await expect(busy).resolves.toBe(1);
    pool.close();
    const inline = new WorkerPool<Api>({ size: 0, inline: makeApi(7) });
    const alone: number[] = [];
    inline.notifyAll(async (api) => {
      alone.push(await api.whoami());
    });
    await expect.poll(() => alone).toEqual([7]);
  });

  it("replaces a crashed worker, rejects its job by name and tells the user", async () => {
    const { workers, createWorker } = recordedWorkers();
    const told: string[] = [];
    const pool = new WorkerPool<Api>({
      size: 1,
      createWorker,
      onCrash: (m) => told.push(m),
    });
    const job = pool.run("eval", 1, "echo", [1, 1000]);
    workers[0].crash();
    await expect(job).rejects.toMatchObject({ name: "WorkerCrashError" });
    expect(workers[0].terminated).toBe(true);
    expect(workers).toHaveLength(2);
    expect(told[0]).toMatch(/crashed \(boom\).*plan is intact/);
    await expect(pool.run("eval", 2, "echo", [7, 0])).resolves.toBe(7);
    pool.close();
  });
});
