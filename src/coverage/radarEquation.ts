/**
 * The radar equation in its energy form, one formula for pulsed and FMCW radars (DESIGN.md model step 4):
 *
 *   SNR = E · G_t · G_r · λ² · σ · F⁴ / ((4π)³ · R⁴ · k_B · T0 · F_n · L),   E = P_peak · τ · N = P_avg · T_int
 *
 * with τ the pulse width (pulsed) or chirp ramp duration (FMCW) and N the pulses or chirps integrated
 * coherently in one look. This is the matched-filter SNR after coherent integration: the single-pulse
 * radar equation (Skolnik, Introduction to Radar Systems, 3rd ed., 2001, ch. 2; Richards, Fundamentals of
 * Radar Signal Processing, 2nd ed., 2014, ch. 2; chapter references from memory) with P_t·τ replaced by the
 * energy of N coherently integrated pulses. Term-by-term checks: tests/reference/radarEquation.test.ts.
 *
 * All functions are total: NaN in gives NaN out, inputs out of domain give NaN, never a throw.
 * Rules RE1–RE7 in docs/model-spec.md (waveform figures: RE8, waveform.ts).
 */

import { BOLTZMANN_J_PER_K, REFERENCE_TEMPERATURE_K } from "./constants.ts";
import type { RadarModel } from "./radarModel.ts";
import { dbToLinear, linearToDb } from "./units.ts";
import { coherentPulseCount, noiseBandwidthHz, pulseDurationS, wavelengthM } from "./waveform.ts";

/**
 * Everything the radar equation needs, in one object so that no two numbers can be swapped.
 * Losses are two-way and positive (a loss of 3 dB halves the SNR).
 */
export interface RadarEquationParams {
  /** Peak transmitted power at the antenna port, W ≥ 0 (CW power for FMCW). */
  peakPowerW: number;
  /** Transmitter-on time of one pulse (pulse width) or one chirp ramp, s > 0. */
  pulseDurationS: number;
  /** Pulses or chirps integrated coherently in one look, ≥ 1. */
  pulsesIntegrated: number;
  /** Carrier frequency, Hz > 0. */
  frequencyHz: number;
  /** Transmit antenna gain, dBi: towards the target for snrAtRange, the peak gain for snrConstant. */
  txGainDbi: number;
  /** Receive antenna gain, dBi: towards the target for snrAtRange, the peak gain for snrConstant. */
  rxGainDbi: number;
  /** Target radar cross-section, m² ≥ 0. */
  rcsM2: number;
  /** Receiver noise figure F_n, dB (T_s = T0 · F_n). */
  noiseFigureDb: number;
  /** Two-way system losses (RF, processing, beam shape), dB. */
  systemLossDb: number;
  /** Two-way gaseous (atmospheric) loss at this range, dB; default 0. */
  atmosphericLossDb?: number;
  /** Two-way rain loss at this range, dB; default 0. */
  rainLossDb?: number;
  /**
   * Two-way pattern propagation factor F⁴ in dB, 40·log10(F); default 0 (free space). Negative for a loss:
   * a one-way diffraction loss J dB gives −2·J (see twoWayFactorFromOneWayLossDb).
   */
  propagationFactorDb?: number;
  /**
   * Receiver noise bandwidth, Hz > 0, used only to present the link budget in bandwidth form
   * (it cancels in the SNR); default 1/pulseDurationS.
   */
  noiseBandwidthHz?: number;
}

const FOUR_PI_CUBED = (4 * Math.PI) ** 3;

function orDefault(x: number | undefined, fallback: number): number {
  return x === undefined ? fallback : x;
}

/**
 * Sum of the two-way losses in p, dB: L = L_sys + L_atm + L_rain (losses multiply as ratios, so they add
 * in dB).
 * @param p systemLossDb, dB, finite (positive = loss; negative is accepted as a gain); atmosphericLossDb
 *   and rainLossDb, dB, default 0 when undefined.
 * @returns dB; NaN when any is NaN; ±Infinity propagates (and then snrConstant gives NaN).
 * Reference: the single loss factor L of the radar equation as the product of its parts (Blake, Radar
 * Range-Performance Analysis, 1980 (Artech House ed. 1986), "Monostatic Radar Range Equation", p. 12;
 * title and page from the book's contents, equation number not checked; common practice).
 */
export function totalLossDb(p: RadarEquationParams): number {
  return p.systemLossDb + orDefault(p.atmosphericLossDb, 0) + orDefault(p.rainLossDb, 0);
}

/** True when the parameters lie in the domain of the radar equation. */
function inDomain(p: RadarEquationParams): boolean {
  return (
    p.peakPowerW >= 0 &&
    Number.isFinite(p.peakPowerW) &&
    p.pulseDurationS > 0 &&
    Number.isFinite(p.pulseDurationS) &&
    p.pulsesIntegrated >= 1 &&
    Number.isFinite(p.pulsesIntegrated) &&
    p.frequencyHz > 0 &&
    Number.isFinite(p.frequencyHz) &&
    p.rcsM2 >= 0 &&
    Number.isFinite(p.rcsM2) &&
    Number.isFinite(p.txGainDbi) &&
    Number.isFinite(p.rxGainDbi) &&
    Number.isFinite(p.noiseFigureDb) &&
    Number.isFinite(totalLossDb(p)) &&
    !Number.isNaN(orDefault(p.propagationFactorDb, 0))
  );
}

/**
 * Per-radar (per-target) constant C of the radar equation, in m⁴ (SNR · m⁴):
 *
 *   C = P_peak · τ · N · G_t · G_r · λ² · σ / ((4π)³ · k_B · T0 · F_n · L)
 *
 * It includes: the transmitted energy per look (peak power × pulse/chirp duration × count), the two
 * gains as given in p (pass the PEAK gains), λ², the RCS, (4π)³, the noise density k_B·T0·F_n, and all
 * two-way losses in p (system, atmospheric, rain). It excludes the propagation factor F⁴ and R⁴.
 * A per-cell kernel then computes, with one multiply chain,
 *
 *   SNR = C · g_t · g_r · F⁴ / R⁴
 *
 * where g_t, g_r are the linear gains relative to peak towards the cell (antennaPattern.ts,
 * makeTwoWayRelativeGain) and F⁴ is linear. Range-dependent attenuation should then be left out of p
 * (0 dB) and multiplied per cell as a linear factor.
 * @param p peak power W ≥ 0, duration s > 0, count ≥ 1, frequency Hz > 0, gains dBi, RCS m² ≥ 0,
 *   noise figure dB, losses dB (all finite; see RadarEquationParams).
 * @returns m⁴; 0 for zero power or zero RCS; NaN when any input it uses is NaN, infinite or out of domain.
 * Reference: the radar equation of the module header with R⁴ and F⁴ taken out: Skolnik, Introduction to
 * Radar Systems, 3rd ed., 2001, ch. 2 (radar equation with T_s = T0·F_n and losses; from memory, section
 * and equation number not checked); Blake, Radar Range-Performance Analysis, 1980 (Artech House ed.
 * 1986), sections "Monostatic Radar Range Equation" (p. 12) and "Equations for Pulse and Other Waveforms"
 * (p. 18) of the first chapter (titles and pages from the book's contents, equation numbers not
 * checked); E = P_t·τ·N is the energy form (common practice).
 */
export function snrConstant(p: RadarEquationParams): number {
  if (!inDomain(p)) return Number.NaN;
  const lambdaM = wavelengthM(p.frequencyHz);
  const energyJ = p.peakPowerW * p.pulseDurationS * p.pulsesIntegrated;
  const gains = dbToLinear(p.txGainDbi + p.rxGainDbi - p.noiseFigureDb - totalLossDb(p));
  return (
    (energyJ * gains * lambdaM * lambdaM * p.rcsM2) /
    (FOUR_PI_CUBED * BOLTZMANN_J_PER_K * REFERENCE_TEMPERATURE_K)
  );
}

/**
 * Linear SNR of one look at a range: SNR = C · F⁴ / R⁴ (energy form, module header), with the gains of p
 * taken as the gains towards the target.
 * @param p radar-equation parameters (see RadarEquationParams for units and ranges).
 * @param rangeM slant range, m ≥ 0.
 * @returns linear SNR ≥ 0; +Infinity at R = 0 (C > 0); 0 at R = +Infinity or for C·F⁴ = 0; NaN for R < 0, NaN, or p out of domain.
 * Reference: the monostatic radar range equation with pattern propagation factor F⁴ (Blake, Radar
 * Range-Performance Analysis, 1980 (Artech House ed. 1986), sections "Monostatic Radar Range Equation"
 * (p. 12) and "Equations for Pulse and Other Waveforms" (p. 18) of the first chapter; titles and pages
 * from the book's contents, equation numbers not checked); single-pulse
 * form: Skolnik, Introduction to Radar Systems, 3rd ed., 2001, ch. 2, and Richards, Fundamentals of
 * Radar Signal Processing, 2nd ed., 2014, §2.2 (both from memory, equation numbers not checked).
 */
export function snrAtRange(p: RadarEquationParams, rangeM: number): number {
  if (!(rangeM >= 0)) return Number.NaN;
  const c = snrConstant(p) * dbToLinear(orDefault(p.propagationFactorDb, 0));
  if (c === 0) return 0;
  const r2 = rangeM * rangeM;
  return c / (r2 * r2);
}

/**
 * SNR of one look at a range in dB: 10·log10(snrAtRange(p, rangeM)).
 * @returns dB; +Infinity at R = 0; -Infinity for zero power or RCS; NaN as snrAtRange.
 */
export function snrAtRangeDb(p: RadarEquationParams, rangeM: number): number {
  return linearToDb(snrAtRange(p, rangeM));
}

/**
 * Free-space range at which a required SNR is reached, m: R = (C · F⁴ / SNR_req)^(1/4), the inverse of
 * snrAtRange with every term of p held fixed (losses and F⁴ as given, not re-evaluated at the new range).
 * @param p radar-equation parameters (see RadarEquationParams for units and ranges).
 * @param requiredSnrDb required SNR, dB (any real).
 * @returns metres ≥ 0; +Infinity for requiredSnrDb = −Infinity; 0 for zero power or RCS; NaN for NaN or p out of domain.
 * Reference: the maximum-range form R_max = [P_t·G·A_e·σ / ((4π)²·S_min)]^(1/4) (Skolnik, Introduction
 * to Radar Systems, 3rd ed., 2001, §1.2 and ch. 2; from memory, equation numbers not checked), here in
 * the energy form of the module header (Blake, Radar Range-Performance Analysis, 1980 (Artech House ed.
 * 1986), "Monostatic Radar Range Equation", p. 12, and "Equations for Pulse and Other Waveforms", p. 18;
 * titles and pages from the book's contents, equation numbers not checked).
 */
export function rangeForSnr(p: RadarEquationParams, requiredSnrDb: number): number {
  if (Number.isNaN(requiredSnrDb)) return Number.NaN;
  const c = snrConstant(p) * dbToLinear(orDefault(p.propagationFactorDb, 0));
  return Math.sqrt(Math.sqrt(c / dbToLinear(requiredSnrDb)));
}

/** Metres per kilometre (definition of the kilometre). */
const M_PER_KM = 1000;
/** d(10·log10 R⁴)/d(ln R), dB per neper of range: 40 / ln 10. */
const DB_PER_LN_RANGE = 40 / Math.LN10;

/**
 * Range at which a required SNR is reached when a uniform specific attenuation acts along the path, m:
 * the root of 10·log10(C·F⁴) − 40·log10 R − 2·γ·R/1000 = SNR_req (γ one way in dB/km, as ITU-R P.676 and
 * P.838 give it; the loss counts both ways). Solved by Newton's method in ln R from the free-space range,
 * which converges monotonically because the left side is concave and decreasing in ln R. The losses
 * already in p (system, atmospheric, rain) are applied as given, in addition to γ.
 * @param p radar-equation parameters (see RadarEquationParams for units and ranges).
 * @param requiredSnrDb required SNR, dB (any real; −Infinity gives +Infinity).
 * @param specificAttenuationDbPerKm one-way specific attenuation γ, dB/km ≥ 0 (0 gives rangeForSnr).
 * @returns metres ≥ 0, never beyond the free-space range; NaN for NaN, γ < 0, or p out of domain.
 * References: path attenuation A = γ·r on a terrestrial path (ITU-R P.676-12 Annex 1 §2.1, terrestrial
 * paths; equation number not checked); rain γ_R = k·R^α (ITU-R P.838-3 eq. (1)); the range equation
 * solved with an absorption loss that grows with range (Blake, Radar Range-Performance Analysis, 1980
 * (Artech House ed. 1986), "Tropospheric Absorption", p. 197; section title and page from the book's
 * contents, equation number not checked); Newton's method (common practice).
 */
export function rangeForSnrWithAttenuation(
  p: RadarEquationParams,
  requiredSnrDb: number,
  specificAttenuationDbPerKm: number,
): number {
  const freeSpaceM = rangeForSnr(p, requiredSnrDb);
  if (!(specificAttenuationDbPerKm >= 0) || Number.isNaN(freeSpaceM)) return Number.NaN;
  if (specificAttenuationDbPerKm === 0 || freeSpaceM === 0) return freeSpaceM;
  const twoWayDbPerM = (2 * specificAttenuationDbPerKm) / M_PER_KM;
  if (!Number.isFinite(freeSpaceM)) return Number.POSITIVE_INFINITY;
  // h(x) = 40·log10(e^x) + a·e^x − 40·log10(R0), increasing and convex in x = ln R; h(ln R0) ≥ 0.
  const x0 = Math.log(freeSpaceM);
  let x = x0;
  for (let i = 0; i < 100; i++) {
    const r = Math.exp(x);
    const h = DB_PER_LN_RANGE * (x - x0) + twoWayDbPerM * r;
    const step = h / (DB_PER_LN_RANGE + twoWayDbPerM * r);
    x -= step;
    if (Math.abs(step) < 1e-14) break;
  }
  return Math.min(Math.exp(x), freeSpaceM);
}

/**
 * Two-way propagation factor F⁴ (linear) from a one-way excess loss J in dB (e.g. knife-edge
 * diffraction, ITU-R P.526): F² = 10^(−J/10) one way, so F⁴ = 10^(−2J/10).
 * @param oneWayLossDb one-way loss, dB (≥ 0 for a loss; negative for a gain such as multipath reinforcement).
 * @returns linear factor ≥ 0 (> 0 for a finite loss); 0 for +Infinity dB; +Infinity for −Infinity dB; NaN for NaN.
 * References: F is the one-way field ratio of the pattern propagation factor, entering the range equation
 * as F⁴ = F_t²·F_r² with F_t = F_r on a monostatic path (Blake, Radar Range-Performance Analysis, 1980
 * (Artech House ed. 1986), "The Pattern Propagation Factor", p. 239; section title and page from
 * the book's contents, equation number not checked); the knife-edge J(v) of ITU-R P.526-15 §4.1 eq. (31)
 * is one such loss (see propagation.ts knifeEdgeLossDb).
 */
export function twoWayFactorFromOneWayLossDb(oneWayLossDb: number): number {
  return dbToLinear(-2 * oneWayLossDb);
}

/** Target- and path-dependent terms that complete a radar's parameters. */
export interface RadarEquationTarget {
  /** Target radar cross-section, m² ≥ 0. */
  rcsM2: number;
  /** Transmit gain towards the target, dBi; default the transmit antenna's peak gain. */
  txGainDbi?: number;
  /** Receive gain towards the target, dBi; default the receive antenna's peak gain. */
  rxGainDbi?: number;
  /** Two-way atmospheric loss, dB; default 0. */
  atmosphericLossDb?: number;
  /** Two-way rain loss, dB; default 0. */
  rainLossDb?: number;
  /** Two-way propagation factor 40·log10(F), dB; default 0 (free space). */
  propagationFactorDb?: number;
}

/**
 * Radar-equation parameters of a radar model against a target: peak power, pulse or chirp duration and
 * count from the waveform, peak gains of the transmit and receive antennas (receive falls back to
 * transmit), noise figure, system loss, and the waveform's noise bandwidth for the link budget.
 * @param model a validated radar model (src/io); values out of domain propagate as NaN results
 *   (e.g. a bad waveform gives a NaN pulseDurationS, and then snrConstant gives NaN).
 * @param target RCS m² ≥ 0; optional gains towards the target, dBi; two-way losses, dB; propagation
 *   factor 40·log10(F), dB.
 * @returns a RadarEquationParams object (no validation here: see the functions that consume it).
 * Reference: a mapping of the model onto the terms of the radar equation (module header), with the system
 * noise temperature T_s = T0·F_n (T0 = 290 K; Blake, Radar Range-Performance Analysis, 1980 (Artech
 * House ed. 1986), "System Noise Temperature", p. 140; section title and page from the book's
 * contents, equation number not checked; common practice).
 */
export function radarEquationParams(model: RadarModel, target: RadarEquationTarget): RadarEquationParams {
  const rxAntenna = model.rxAntenna ?? model.txAntenna;
  return {
    peakPowerW: model.transmitter.peakPowerW,
    pulseDurationS: pulseDurationS(model.waveform),
    pulsesIntegrated: coherentPulseCount(model.waveform),
    frequencyHz: model.frequencyHz,
    txGainDbi: target.txGainDbi ?? model.txAntenna.peakGainDbi,
    rxGainDbi: target.rxGainDbi ?? rxAntenna.peakGainDbi,
    rcsM2: target.rcsM2,
    noiseFigureDb: model.receiver.noiseFigureDb,
    systemLossDb: model.receiver.systemLossDb,
    atmosphericLossDb: target.atmosphericLossDb ?? 0,
    rainLossDb: target.rainLossDb ?? 0,
    propagationFactorDb: target.propagationFactorDb ?? 0,
    noiseBandwidthHz: noiseBandwidthHz(model.waveform),
  };
}
