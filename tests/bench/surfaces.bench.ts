/**
 * Benchmark of the terrain stage: bilinear resampling of a geographic DEM onto a 2048 × 2048 UTM
 * site grid (one proj4 transform per cell), and burning 10 000 building footprints and 200 tree
 * stands onto it. Median milliseconds over several runs; timings are printed, never asserted.
 * Run alone with `npx tsx tests/bench/surfaces.bench.ts`, or through `npm run bench`.
 */
import type { GridFrame } from "../../src/coverage/grid.ts";
import { type BuildingShape, burnObstructions, type TreeStandShape } from "../../src/coverage/surfaces.ts";
import { resampleToFrame, type SourceRaster } from "../../src/io/demResample.ts";

const SIDE = 2048;
const RUNS = 5;
const BUILDINGS = 10_000;
const TREE_STANDS = 200;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function time(f: () => void): number[] {
  f(); // warm-up (JIT)
  const ms: number[] = [];
  for (let r = 0; r < RUNS; r++) {
    const t = performance.now();
    f();
    ms.push(performance.now() - t);
  }
  return ms;
}

function line(label: string, ms: number[], cells: number): string {
  const m = median(ms);
  return (
    `${label}: median ${m.toFixed(0)} ms (min ${Math.min(...ms).toFixed(0)}, max ${Math.max(...ms).toFixed(0)}, ` +
    `${RUNS} runs), ${((m * 1e6) / cells).toFixed(1)} ns/cell`
  );
}

/** Deterministic pseudo-random numbers in [0, 1) (a linear congruential generator). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1103515245) + 12345) >>> 0;
    return s / 4294967296;
  };
}

export async function run(): Promise<void> {
  // A 1″ geographic DEM of 3000 × 3000 samples over 11°–11.83° E, 46.4°–47.23° N.
  const n = 3000;
  const step = 1 / 3600;
  const data = new Float32Array(n * n);
  for (let r = 0; r < n; r++)
    for (let c = 0; c < n; c++) data[r * n + c] = 800 + 200 * Math.sin(c / 300) * Math.cos(r / 250);
  const source: SourceRaster = {
    data,
    width: n,
    height: n,
    originX: 11,
    originY: 47.23,
    pixelSizeX: step,
    pixelSizeY: step,
    crs: "+proj=longlat +datum=WGS84 +no_defs",
  };
  // 2048 × 2048 cells of 5 m (10.24 km square) in UTM 32N inside that DEM.
  const frame: GridFrame = {
    width: SIDE,
    height: SIDE,
    originX: 660_000,
    originY: 5_225_000,
    cellSizeM: 5,
    crs: "+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs",
  };
  const cells = SIDE * SIDE;
  let covered = 0;
  let ground = resampleToFrame(source, frame).grid;
  const resampleMs = time(() => {
    const r = resampleToFrame(source, frame);
    ground = r.grid;
    covered = r.coveredFraction;
  });
  console.log(
    line(`demResample geographic → UTM, ${cells} cells (covered ${covered.toFixed(3)})`, resampleMs, cells),
  );

  const rand = lcg(2026);
  const extentM = SIDE * frame.cellSizeM;
  const rect = (x: number, y: number, w: number, h: number) =>
    Float64Array.from([x, y, x + w, y, x + w, y + h, x, y + h]);
  const buildings: BuildingShape[] = [];
  for (let i = 0; i < BUILDINGS; i++) {
    const x = frame.originX + rand() * extentM;
    const y = frame.originY - rand() * extentM;
    buildings.push({
      rings: [rect(x, y, 8 + rand() * 40, 8 + rand() * 40)],
      heightM: 3 + rand() * 40,
      minHeightM: 0,
    });
  }
  const trees: TreeStandShape[] = [];
  for (let i = 0; i < TREE_STANDS; i++) {
    // A 32-vertex blob of about 150 m radius.
    const cx = frame.originX + rand() * extentM;
    const cy = frame.originY - rand() * extentM;
    const ring = new Float64Array(64);
    for (let k = 0; k < 32; k++) {
      const a = (2 * Math.PI * k) / 32;
      const rM = 100 + rand() * 100;
      ring[2 * k] = cx + rM * Math.cos(a);
      ring[2 * k + 1] = cy + rM * Math.sin(a);
    }
    trees.push({ rings: [ring], canopyHeightM: 10 + rand() * 15 });
  }
  let burned = 0;
  const burnMs = time(() => {
    const { obstructionTopAglM } = burnObstructions(ground, buildings, trees);
    burned = 0;
    for (let i = 0; i < obstructionTopAglM.length; i++) if (obstructionTopAglM[i] > 0) burned++;
  });
  console.log(
    line(
      `burnObstructions ${BUILDINGS} buildings + ${TREE_STANDS} tree stands (${burned} cells burned)`,
      burnMs,
      cells,
    ),
  );
}

if (process.argv[1]?.endsWith("surfaces.bench.ts")) {
  await run();
}
