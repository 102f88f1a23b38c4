/**
 * Fewer progress reports from a worker. Each report is a message to the page and a re-render of its
 * progress bar, and in a headless or GPU-less browser every repaint costs the compositor several ms
 * of a core the workers need; a release after a drag (about 150 ms) has no time to spend on them.
 */
import type { ProgressListener } from "./protocol";

/** Shortest time between two progress reports of one run, ms (about what the eye follows). */
export const PROGRESS_INTERVAL_MS = 100;

/**
 * `listener`, called at most once per `intervalMs` and not before `intervalMs` after this call:
 * reports in between are dropped (each report states the whole progress, so none is lost in meaning).
 */
export function throttleProgress(
  listener: ProgressListener | undefined,
  intervalMs: number = PROGRESS_INTERVAL_MS,
  clock: () => number = () => performance.now(),
): ProgressListener | undefined {
  if (listener === undefined) return undefined;
  let last = clock();
  return (p) => {
    const t = clock();
    if (t - last < intervalMs) return;
    last = t;
    listener(p);
  };
}
