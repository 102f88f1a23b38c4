/**
 * Benchmark of the per-cell Pd lookup: pdFromSnrArray over 4 M cells (a 2048 × 2048 grid), median
 * nanoseconds per cell over several runs. Timings are printed, never asserted.
 * Run alone with `npx tsx tests/bench/pdTable.bench.ts`, or through `npm run bench`.
 */
import { buildPdTable, pdFromSnrArray } from "../../src/coverage/pdTable.ts";
import { dbToLinear } from "../../src/coverage/units.ts";

const CELLS = 4 * 1024 * 1024;
const RUNS = 9;
/** Per-look SNR spread of a coverage grid, dB: from deep in the noise to close to the radar. */
const SNR_LOW_DB = -30;
const SNR_SPAN_DB = 90;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** Times pdFromSnrArray on 4 M cells and prints ns per cell (median of RUNS) and the table build time. */
export async function run(): Promise<void> {
  const t0 = performance.now();
  const table = buildPdTable({ pfa: 1e-6, looks: 10, swerling: 1 });
  const buildMs = performance.now() - t0;

  // Deterministic pseudo-random SNRs (a linear congruential generator), so runs compare like for like;
  // a few cells are NaN (nodata) and 0 (masked), as on a real grid.
  const snr = new Float32Array(CELLS);
  let seed = 12345;
  for (let i = 0; i < CELLS; i++) {
    seed = (Math.imul(seed, 1103515245) + 12345) >>> 0;
    const u = seed / 4294967296;
    snr[i] = i % 97 === 0 ? Number.NaN : i % 89 === 0 ? 0 : dbToLinear(SNR_LOW_DB + SNR_SPAN_DB * u);
  }
  const out = new Float32Array(CELLS);
  pdFromSnrArray(table, snr, out); // warm-up (JIT)

  const nsPerCell: number[] = [];
  for (let r = 0; r < RUNS; r++) {
    const t = performance.now();
    pdFromSnrArray(table, snr, out);
    nsPerCell.push(((performance.now() - t) * 1e6) / CELLS);
  }
  let check = 0;
  for (let i = 0; i < CELLS; i += 4099) check += out[i];
  console.log(
    `pdTable: build ${buildMs.toFixed(1)} ms (${table.values.length} nodes); ` +
      `pdFromSnrArray on ${CELLS} cells: median ${median(nsPerCell).toFixed(2)} ns/cell ` +
      `(min ${Math.min(...nsPerCell).toFixed(2)}, max ${Math.max(...nsPerCell).toFixed(2)}, ${RUNS} runs; checksum ${check.toFixed(3)})`,
  );
}

if (process.argv[1]?.endsWith("pdTable.bench.ts")) {
  await run();
}
