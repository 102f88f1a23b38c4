/**
 * Antenna gain estimates for data sheets that give beamwidths but no gain, or an element count:
 * from the two half-power beamwidths (solid-angle rules) and from the size of a microstrip patch array.
 * Rule AP8 in docs/model-spec.md. Total functions: NaN for inputs out of domain.
 */

import {
  DEFAULT_PATCH_ELEMENT_GAIN_DBI,
  DEFAULT_PATCH_FEED_LOSS_DB_PER_LEVEL,
  PRACTICAL_BEAMWIDTH_GAIN_DEG2,
} from "./constants.ts";
import { degToRad, linearToDb } from "./units.ts";

function isBeamwidth(deg: number): boolean {
  return Number.isFinite(deg) && deg > 0;
}

/**
 * Directivity of a lossless, sidelobe-free beam from its half-power beamwidths, dBi:
 * D ≈ 4π / (θaz · θel) with the angles in radians, i.e. 41 253 / (θaz° · θel°)
 * (Kraus, Antennas, 2nd ed., 1988, approximate directivity from beam solid angle; Balanis, Antenna
 * Theory, 3rd ed., eq. 2-26; equation number from memory). An upper bound on the gain of a real antenna.
 * Valid for pencil and fan beams narrower than about 60°; wider beams are still computed.
 * @param azBeamwidthDeg, elBeamwidthDeg half-power beamwidths, degrees > 0.
 * @returns dBi; NaN for a non-positive or non-finite beamwidth.
 */
export function directivityFromBeamwidthsDbi(azBeamwidthDeg: number, elBeamwidthDeg: number): number {
  if (!isBeamwidth(azBeamwidthDeg) || !isBeamwidth(elBeamwidthDeg)) return Number.NaN;
  return linearToDb((4 * Math.PI) / (degToRad(azBeamwidthDeg) * degToRad(elBeamwidthDeg)));
}

/**
 * Practical gain from the half-power beamwidths, dBi: G ≈ 26 000 / (θaz° · θel°), the rule of thumb that
 * folds a typical efficiency (≈ 0.63) into the constant (common practice, from memory; constants.ts).
 * @param azBeamwidthDeg, elBeamwidthDeg half-power beamwidths, degrees > 0.
 * @returns dBi; NaN for a non-positive or non-finite beamwidth.
 */
export function practicalGainFromBeamwidthsDbi(azBeamwidthDeg: number, elBeamwidthDeg: number): number {
  if (!isBeamwidth(azBeamwidthDeg) || !isBeamwidth(elBeamwidthDeg)) return Number.NaN;
  return linearToDb(PRACTICAL_BEAMWIDTH_GAIN_DEG2 / (azBeamwidthDeg * elBeamwidthDeg));
}

/** A uniformly fed planar array of microstrip patches with a corporate feed. */
export interface PatchArray {
  /** Number of patch elements, an integer ≥ 1 (4 for a 2 × 2, 16 for a 4 × 4). */
  elementCount: number;
  /** Gain of one element, dBi; default DEFAULT_PATCH_ELEMENT_GAIN_DBI (constants.ts). */
  elementGainDbi?: number;
  /** Feed loss per level of power division, dB ≥ 0; default DEFAULT_PATCH_FEED_LOSS_DB_PER_LEVEL. */
  feedLossDbPerLevel?: number;
}

/**
 * Gain of a patch array, dBi: G = G_element + 10·log10(N) − L_feed · log2(N). The array factor of N
 * uniformly fed, well-spaced elements adds 10·log10 N; the corporate feed has log2 N levels of division,
 * each adding line loss (common practice). At 5.8 GHz the defaults give ≈ 10.6 dBi for 2 × 2 and ≈ 16 dBi
 * for 4 × 4, each doubling ≈ +2.7 dB (facts of the trade, common practice; tests/reference).
 * @returns dBi; NaN for a non-integer or < 1 element count, or a NaN / negative feed loss.
 */
export function patchArrayGainDbi(array: PatchArray): number {
  const n = array.elementCount;
  if (!Number.isInteger(n) || n < 1) return Number.NaN;
  const elementGainDbi = array.elementGainDbi ?? DEFAULT_PATCH_ELEMENT_GAIN_DBI;
  const feedLossDb = array.feedLossDbPerLevel ?? DEFAULT_PATCH_FEED_LOSS_DB_PER_LEVEL;
  if (!(feedLossDb >= 0) || !Number.isFinite(elementGainDbi)) return Number.NaN;
  return elementGainDbi + linearToDb(n) - feedLossDb * Math.log2(n);
}
