/** Medians and spreads for the benchmarks (printed, never asserted). */

export interface Spread {
  median: number;
  min: number;
  max: number;
}

/** Median (mean of the middle two for an even count), minimum and maximum of `xs`. */
export function spread(xs: readonly number[]): Spread {
  const s = [...xs].sort((a, b) => a - b);
  const n = s.length;
  const median = n % 2 ? s[(n - 1) >> 1] : (s[n / 2 - 1] + s[n / 2]) / 2;
  return { median, min: s[0], max: s[n - 1] };
}

/** "median ms (min–max)" with whole milliseconds. */
export function msText(xs: readonly number[]): string {
  const s = spread(xs);
  return `${s.median.toFixed(0)} ms (${s.min.toFixed(0)}–${s.max.toFixed(0)})`;
}
