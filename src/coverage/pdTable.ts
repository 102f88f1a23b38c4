/**
 * A precomputed Pd(SNR) table for one (Pfa, looks, Swerling case), for per-cell use: a lookup costs
 * two integer operations, two table reads and one multiply-add, no logarithm or special function.
 *
 * Indexing: the IEEE-754 bit pattern of a positive Float32 is a piecewise-linear log2 of its value
 * (exponent in the high bits, mantissa linear below). The top 8 mantissa bits pick one of 256 bins
 * per octave of SNR and the remaining 15 bits interpolate linearly inside it; each bin is at most
 * 1/256 of its SNR wide (≤ 0.017 dB). Rules PD11–PD13 in docs/model-spec.md ("Detection").
 */
import { pdExact, type SwerlingCase } from "./detection.ts";

/** Lowest tabulated SNR is 2^LOW_OCTAVE (≈ −30.1 dB); below it Pd follows the chord to (0, Pfa). */
const LOW_OCTAVE = -10;
/** Highest tabulated SNR is 2^HIGH_OCTAVE (≈ +72.2 dB); above it Pd is held at its value there. */
const HIGH_OCTAVE = 24;
/** log2 of the bins per octave. */
const BIN_BITS = 8;
/** IEEE-754 binary32 layout (IEEE Std 754-2019 §3.4): 23 mantissa bits, exponent bias 127. */
const F32_MANTISSA_BITS = 23;
const F32_EXPONENT_BIAS = 127;
/** Bit pattern of +Infinity; every pattern above it (as unsigned) is a NaN or a negative number. */
const F32_POSITIVE_INFINITY_BITS = 0x7f800000;

/**
 * A Pd table for one detection setting. A plain object of numbers and one Float32Array, so it can
 * be posted to a worker (structured clone) or transferred with its `values` buffer.
 */
export interface PdTable {
  /** False-alarm probability the table was built for. */
  pfa: number;
  /** Looks integrated non-coherently. */
  looks: number;
  /** Swerling case. */
  swerling: SwerlingCase;
  /** Float32 bit pattern of the lowest tabulated SNR (node 0). */
  bitsLow: number;
  /** Float32 bit pattern of the highest tabulated SNR (last node). */
  bitsHigh: number;
  /** Right shift from (bits − bitsLow) to the bin index. */
  shift: number;
  /** Mask of the within-bin bits. */
  fracMask: number;
  /** 2^−shift: within-bin bits to a fraction in [0, 1). */
  fracScale: number;
  /** Pd at each node, node j at bit pattern bitsLow + (j << shift). */
  values: Float32Array;
  /** Lowest tabulated SNR, linear. */
  snrLowLinear: number;
  /** Slope of the chord from (0, Pfa) to (snrLowLinear, Pd there), per unit linear SNR. */
  lowSlope: number;
  /** Pd at the highest tabulated SNR (held above it). */
  pdHigh: number;
}

/** Parameters of {@link buildPdTable}. */
export interface PdTableOptions {
  /** False-alarm probability, in (0, 1). */
  pfa: number;
  /** Looks integrated non-coherently, integer ≥ 1. */
  looks: number;
  /** Swerling case 0–4. */
  swerling: SwerlingCase;
}

const scratchF32 = new Float32Array(1);
const scratchU32 = new Uint32Array(scratchF32.buffer);

function f32FromBits(bits: number): number {
  scratchU32[0] = bits;
  return scratchF32[0];
}

/**
 * Builds the Pd table for one (Pfa, looks, Swerling case) from {@link pdExact} at 256 nodes per
 * octave of per-look SNR from 2^−10 (−30.1 dB) to 2^24 (+72.2 dB), 8705 nodes.
 *
 * Inputs: `pfa` in (0, 1); `looks` integer ≥ 1; `swerling` 0–4.
 * Output: a {@link PdTable}. Cost: one exact Pd per node (tens of milliseconds).
 * Edges: throws a RangeError naming the field when an option is out of domain (a table is built
 * once per radar and target, at the edge where the settings are validated).
 * Accuracy against pdExact over −20…+50 dB: measured in tests/unit/pdTable.test.ts (≤ 1e-4 in Pd).
 */
export function buildPdTable(opts: PdTableOptions): PdTable {
  const { pfa, looks, swerling } = opts;
  if (!(pfa > 0 && pfa < 1)) throw new RangeError(`pfa: ${pfa} must be in (0, 1)`);
  if (!(Number.isInteger(looks) && looks >= 1)) {
    throw new RangeError(`looks: ${looks} must be an integer ≥ 1`);
  }
  if (!(swerling === 0 || swerling === 1 || swerling === 2 || swerling === 3 || swerling === 4)) {
    throw new RangeError(`swerling: ${String(swerling)} must be 0, 1, 2, 3 or 4`);
  }
  const shift = F32_MANTISSA_BITS - BIN_BITS;
  const bitsLow = (F32_EXPONENT_BIAS + LOW_OCTAVE) << F32_MANTISSA_BITS;
  const bitsHigh = (F32_EXPONENT_BIAS + HIGH_OCTAVE) << F32_MANTISSA_BITS;
  const nodes = ((bitsHigh - bitsLow) >>> shift) + 1;
  const values = new Float32Array(nodes);
  for (let j = 0; j < nodes; j++) {
    const snrLinear = f32FromBits(bitsLow + j * (1 << shift));
    values[j] = pdExact({ snrLinear, pfa, looks, swerling });
  }
  const snrLowLinear = f32FromBits(bitsLow);
  return {
    pfa,
    looks,
    swerling,
    bitsLow,
    bitsHigh,
    shift,
    fracMask: (1 << shift) - 1,
    fracScale: 1 / (1 << shift),
    values,
    snrLowLinear,
    lowSlope: (values[0] - pfa) / snrLowLinear,
    pdHigh: values[nodes - 1],
  };
}

/** Pd of one Float32 bit pattern u (value f); shared by the scalar and array lookups. */
function lookup(t: PdTable, u: number, f: number): number {
  if (u < t.bitsLow) return f > 0 ? t.pfa + f * t.lowSlope : 0;
  if (u < t.bitsHigh) {
    const d = u - t.bitsLow;
    const j = d >>> t.shift;
    const a = t.values[j];
    return a + (d & t.fracMask) * t.fracScale * (t.values[j + 1] - a);
  }
  return u <= F32_POSITIVE_INFINITY_BITS ? t.pdHigh : 0;
}

/**
 * Pd from per-look SNR by table lookup with linear interpolation (no logarithm, no special function).
 *
 * Input: `snrLinear`, per-look SNR after coherent integration, linear power ratio (rounded to Float32).
 * Output: Pd in [0, 1], within the table's measured error of {@link pdExact} from −30 to +72 dB.
 * Edges: NaN, −0, 0 and negative SNR give 0 (no echo from the target: the cell counts as not
 * covered; false alarms are not detections); 0 < SNR < 2^−10 follows the straight line from (0, Pfa);
 * SNR above 2^24 (and +Infinity) gives Pd at 2^24 (within 2e-6 of 1 for every case and Pfa ≥ 1e-9).
 */
export function pdFromSnr(table: PdTable, snrLinear: number): number {
  scratchF32[0] = snrLinear;
  return lookup(table, scratchU32[0], scratchF32[0]);
}

/**
 * Pd for a whole array of per-look SNRs (linear), written into `pdOut`; the per-cell hot path.
 * Same values and edges as {@link pdFromSnr}. The SNR array is read through a Uint32 view of its own
 * buffer (no copy). `pdOut` may be the same array as `snrLinear` (in-place).
 *
 * Throws a RangeError naming `pdOut` when it is shorter than `snrLinear`.
 */
export function pdFromSnrArray(table: PdTable, snrLinear: Float32Array, pdOut: Float32Array): void {
  const n = snrLinear.length;
  if (pdOut.length < n) {
    throw new RangeError(`pdOut.length: ${pdOut.length} is shorter than snrLinear.length ${n}`);
  }
  const bits = new Uint32Array(snrLinear.buffer, snrLinear.byteOffset, n);
  const { bitsLow, bitsHigh, shift, fracMask, fracScale, values, pfa, lowSlope, pdHigh } = table;
  for (let i = 0; i < n; i++) {
    const u = bits[i];
    let pd: number;
    if (u >= bitsLow && u < bitsHigh) {
      const d = u - bitsLow;
      const j = d >>> shift;
      const a = values[j];
      pd = a + (d & fracMask) * fracScale * (values[j + 1] - a);
    } else if (u < bitsLow) {
      const f = snrLinear[i];
      pd = f > 0 ? pfa + f * lowSlope : 0;
    } else {
      pd = u <= F32_POSITIVE_INFINITY_BITS ? pdHigh : 0;
    }
    pdOut[i] = pd;
  }
}
