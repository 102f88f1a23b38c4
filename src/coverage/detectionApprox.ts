/**
 * Closed-form approximations of the required per-look SNR, kept as cross-checks of the exact
 * functions in detection.ts: Albersheim's equation (steady target) and Shnidman's equation (Swerling
 * 0–4). Each states its published validity range; their agreement with the exact Pd is tested
 * (rules PD9, PD10 in docs/model-spec.md).
 */
import { fluctuationShape, type SwerlingCase } from "./detection.ts";
import { linearToDb } from "./units.ts";

/** A range of validity of an approximation: Pd, Pfa and look count (inclusive). */
export interface ApproxValidity {
  /** Lowest Pd. */
  pdMin: number;
  /** Highest Pd. */
  pdMax: number;
  /** Lowest Pfa. */
  pfaMin: number;
  /** Highest Pfa. */
  pfaMax: number;
  /** Fewest looks. */
  looksMin: number;
  /** Most looks. */
  looksMax: number;
  /** Accuracy stated by the author inside the range, dB (measured agreement: docs/model-spec.md PD9, PD10). */
  accuracyDb: number;
}

/**
 * Albersheim's stated range: 0.1 ≤ Pd ≤ 0.9, 1e-7 ≤ Pfa ≤ 1e-3, 1 ≤ N ≤ 8096, within 0.2 dB
 * (Albersheim, Proc. IEEE 69(7), 1981; Tufts & Cann, IEEE Trans. AES 19(4), 1983, from memory;
 * Richards FRSP 2nd ed. eq. (6.87) and the text after it).
 */
export const ALBERSHEIM_VALIDITY: ApproxValidity = {
  pdMin: 0.1,
  pdMax: 0.9,
  pfaMin: 1e-7,
  pfaMax: 1e-3,
  looksMin: 1,
  looksMax: 8096,
  accuracyDb: 0.2,
};

/**
 * Shnidman's stated range: 0.1 ≤ Pd ≤ 0.99, 1e-9 ≤ Pfa ≤ 1e-3, 1 ≤ N ≤ 100, within 0.5 dB
 * (Shnidman, "Determination of required SNR values", IEEE Trans. AES 38(3), 2002, from memory;
 * Richards FRSP 2nd ed., text after eq. (6.112)).
 */
export const SHNIDMAN_VALIDITY: ApproxValidity = {
  pdMin: 0.1,
  pdMax: 0.99,
  pfaMin: 1e-9,
  pfaMax: 1e-3,
  looksMin: 1,
  looksMax: 100,
  accuracyDb: 0.5,
};

/** True when (pd, pfa, looks) lie inside an approximation's stated range. */
export function isInValidity(v: ApproxValidity, pd: number, pfa: number, looks: number): boolean {
  return (
    pd >= v.pdMin &&
    pd <= v.pdMax &&
    pfa >= v.pfaMin &&
    pfa <= v.pfaMax &&
    looks >= v.looksMin &&
    looks <= v.looksMax
  );
}

/** Parameters of the steady-target approximations. */
export interface SteadyApproxParams {
  /** Probability of detection, in (0, 1). */
  pd: number;
  /** False-alarm probability, in (0, 1). */
  pfa: number;
  /** Looks integrated non-coherently, ≥ 1. */
  looks: number;
}

// Coefficients of Albersheim's equation (Albersheim 1981; Richards FRSP 2nd ed. eq. (6.87)).
const ALB_PFA_NUMERATOR = 0.62;
const ALB_AB = 0.12;
const ALB_B = 1.7;
const ALB_LOOKS_DB = 5;
const ALB_SLOPE_BASE = 6.2;
const ALB_SLOPE_N = 4.54;
const ALB_N_OFFSET = 0.44;

function albersheimSlope(looks: number): number {
  return ALB_SLOPE_BASE + ALB_SLOPE_N / Math.sqrt(looks + ALB_N_OFFSET);
}

/**
 * Albersheim's equation: required per-look SNR for a steady target, N looks, from Pd and Pfa.
 * SNR_dB = −5 log10 N + (6.2 + 4.54/√(N + 0.44)) · log10(A + 0.12AB + 1.7B), A = ln(0.62/Pfa),
 * B = ln(Pd/(1 − Pd)) (Albersheim, Proc. IEEE 69(7), 1981; Richards FRSP 2nd ed. eq. (6.87)).
 *
 * Inputs: `pd` in (0, 1), `pfa` in (0, 1), `looks` ≥ 1; meant for {@link ALBERSHEIM_VALIDITY}.
 * Measured against the exact square-law SNR (N ≤ 100): within 0.2 dB for Pd 0.5–0.7, 0.3 dB for
 * Pd 0.3–0.9, but up to 4.1 dB near Pd 0.1, Pfa 1e-3 (PD9). Output: SNR in dB.
 * Edges: out-of-domain or NaN inputs, or a log argument ≤ 0 (very low Pd), give NaN.
 */
export function albersheimSnrDb(p: SteadyApproxParams): number {
  const { pd, pfa, looks } = p;
  if (!(pd > 0 && pd < 1) || !(pfa > 0 && pfa < 1) || !(looks >= 1)) return Number.NaN;
  const a = Math.log(ALB_PFA_NUMERATOR / pfa);
  const b = Math.log(pd / (1 - pd));
  const arg = a + ALB_AB * a * b + ALB_B * b;
  if (!(arg > 0)) return Number.NaN;
  return -ALB_LOOKS_DB * Math.log10(looks) + albersheimSlope(looks) * Math.log10(arg);
}

/** Parameters of {@link albersheimPd}. */
export interface AlbersheimPdParams {
  /** Per-look SNR, dB. */
  snrDb: number;
  /** False-alarm probability, in (0, 1). */
  pfa: number;
  /** Looks integrated non-coherently, ≥ 1. */
  looks: number;
}

/**
 * Albersheim's equation solved for Pd: Z = (SNR_dB + 5 log10 N)/(6.2 + 4.54/√(N + 0.44)),
 * B = (10^Z − A)/(1.7 + 0.12A), Pd = 1/(1 + e^(−B)) (Albersheim 1981 solved for Pd; Richards FRSP 2nd ed. eq. (6.89)).
 *
 * Inputs: `snrDb` finite, `pfa` in (0, 1), `looks` ≥ 1; meaningful where the result falls inside
 * {@link ALBERSHEIM_VALIDITY}. Output: Pd in (0, 1). Edges: NaN or out-of-domain inputs give NaN.
 */
export function albersheimPd(p: AlbersheimPdParams): number {
  const { snrDb, pfa, looks } = p;
  if (!Number.isFinite(snrDb) || !(pfa > 0 && pfa < 1) || !(looks >= 1)) return Number.NaN;
  const a = Math.log(ALB_PFA_NUMERATOR / pfa);
  const z = (snrDb + ALB_LOOKS_DB * Math.log10(looks)) / albersheimSlope(looks);
  const b = (10 ** z - a) / (ALB_B + ALB_AB * a);
  return 1 / (1 + Math.exp(-b));
}

/** Parameters of {@link shnidmanSnrDb}. */
export interface ShnidmanParams {
  /** Probability of detection, in (0, 1). */
  pd: number;
  /** False-alarm probability, in (0, 1). */
  pfa: number;
  /** Looks integrated non-coherently, ≥ 1. */
  looks: number;
  /** Swerling case 0–4. */
  swerling: SwerlingCase;
}

// Coefficients of Shnidman's equation (Shnidman 2002; Richards FRSP 2nd ed. eqs. up to (6.112); coefficients from memory).
const SHN_LOOKS_ALPHA_SWITCH = 40;
const SHN_ALPHA_HIGH = 0.25;
const SHN_ETA_SCALE = 0.8;
const SHN_PD_SWITCH = 0.872;
const SHN_C1 = [17.7006, 18.4496, 14.5339, 3.525] as const;
const SHN_C2_EXP_SLOPE = 27.31;
const SHN_C2_EXP_OFFSET = 25.14;
const SHN_C2_PD_PIVOT = 0.8;
const SHN_C2_PFA_WEIGHT = 0.7;
const SHN_C2_PFA_REF = 1e-5;
const SHN_C2_LOOKS_OFFSET = 20;
const SHN_C2_LOOKS_SCALE = 80;

/**
 * Shnidman's equation: required per-look SNR for N square-law looks, Swerling 0–4, from Pd and Pfa.
 * η = √(−0.8 ln(4Pfa(1−Pfa))) + sgn(Pd − ½)·√(−0.8 ln(4Pd(1−Pd))), X∞ = η(η + 2√(N/2 + α − ¼)),
 * a fluctuation correction C_dB = C1 (Pd ≤ 0.872) or C1 + C2 (Pd > 0.872), polynomial in Pd over K, SNR = C·X∞/N (Shnidman, IEEE Trans. AES
 * 38(3), 2002, from memory; Richards FRSP 2nd ed. eqs. up to (6.112)).
 *
 * Inputs: `pd` in (0, 1), `pfa` in (0, 1), `looks` ≥ 1, `swerling` 0–4; meant for
 * {@link SHNIDMAN_VALIDITY}. Measured against the exact SNR (N ≤ 100): steady within 0.5 dB over the
 * whole range, all cases within 0.5 dB for Pd 0.3–0.7 and Pfa 1e-4–1e-7, worst 1.04 dB over the whole
 * range (PD10). Output: SNR in dB.
 * Edges: NaN or out-of-domain inputs give NaN.
 */
export function shnidmanSnrDb(p: ShnidmanParams): number {
  const { pd, pfa, looks, swerling } = p;
  if (!(pd > 0 && pd < 1) || !(pfa > 0 && pfa < 1) || !(looks >= 1)) return Number.NaN;
  // Shnidman's K is the shape of the chi-square RCS law: ∞, 1, N, 2, 2N for cases 0–4.
  const k = fluctuationShape(swerling, looks);
  if (Number.isNaN(k)) return Number.NaN;
  const alpha = looks < SHN_LOOKS_ALPHA_SWITCH ? 0 : SHN_ALPHA_HIGH;
  const eta =
    Math.sqrt(-SHN_ETA_SCALE * Math.log(4 * pfa * (1 - pfa))) +
    Math.sign(pd - 0.5) * Math.sqrt(-SHN_ETA_SCALE * Math.log(4 * pd * (1 - pd)));
  const xInf = eta * (eta + 2 * Math.sqrt(looks / 2 + (alpha - SHN_ALPHA_HIGH)));
  let cDb = 0;
  if (k !== Number.POSITIVE_INFINITY) {
    const [c3, c2, c1, c0] = SHN_C1;
    cDb = (((c3 * pd - c2) * pd + c1) * pd - c0) / k;
    if (pd > SHN_PD_SWITCH) {
      cDb +=
        (Math.exp(SHN_C2_EXP_SLOPE * pd - SHN_C2_EXP_OFFSET) +
          (pd - SHN_C2_PD_PIVOT) *
            (SHN_C2_PFA_WEIGHT * Math.log(SHN_C2_PFA_REF / pfa) +
              (2 * looks - SHN_C2_LOOKS_OFFSET) / SHN_C2_LOOKS_SCALE)) /
        k;
    }
  }
  return cDb + linearToDb(xInf / looks);
}
