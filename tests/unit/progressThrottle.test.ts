import { describe, expect, it } from "vitest";
import { throttleProgress } from "../../src/workers/progressThrottle";

describe("progress throttle", () => {
  it("passes at most one report per interval, none in the run's first interval", () => {
    let t = 1000;
    const heard: number[] = [];
    const report = throttleProgress(
      (p) => heard.push(p.done),
      100,
      () => t,
    );
    if (!report) throw new Error("no listener");
    const at = (ms: number, done: number) => {
      t = 1000 + ms;
      report({ stage: "radars", done, total: 10 });
    };
    at(0, 0);
    at(60, 1);
    at(99.9, 2); // still inside the first 100 ms
    at(100, 3);
    at(150, 4);
    at(200, 5);
    at(450, 6);
    at(460, 7);
    expect(heard).toEqual([3, 5, 6]);
  });

  it("gives no listener for none", () => {
    expect(throttleProgress(undefined)).toBeUndefined();
  });
});
