import { afterEach, describe, expect, it, vi } from "vitest";
import { writeThrough } from "../../src/workers/warmBuffers";

describe("writeThrough", () => {
  afterEach(() => {
    vi.useRealTimers();
  });

  it("writes one array per pause, and stops between two arrays once told to", async () => {
    vi.useFakeTimers();
    const arrays = [new Float32Array(4).fill(1), new Float32Array(4).fill(1), new Float32Array(4).fill(1)];
    const written = () => arrays.map((a) => a.every((x) => x === 0));
    let stop = false;
    const done = writeThrough(arrays, () => stop, 25);
    await vi.advanceTimersByTimeAsync(24);
    expect(written()).toEqual([false, false, false]);
    await vi.advanceTimersByTimeAsync(1);
    expect(written()).toEqual([true, false, false]);
    await vi.advanceTimersByTimeAsync(25);
    expect(written()).toEqual([true, true, false]);
    stop = true;
    await vi.advanceTimersByTimeAsync(25);
    expect(await done).toBe(false);
    expect(written()).toEqual([true, true, false]);
  });
});
