/**
 * Derived waveform figures an engineer checks on a radar data sheet: integration time, duty cycle,
 * energy per look, range and velocity resolution, FMCW maximum range from the IF sampling, blind zone,
 * noise bandwidth. One formula each, for the pulsed and FMCW waveforms of radarModel.ts.
 *
 * Every function is total: an input outside its domain (non-positive durations, rates or counts,
 * NaN) gives NaN, never a throw. Validation with field names happens at the edge (src/io).
 * Derivations: docs/model-spec.md, section "Radar equation (RE…)".
 */

import { SPEED_OF_LIGHT_M_PER_S } from "./constants.ts";
import { wavelengthM } from "./propagation.ts";
import type { FmcwWaveform, Waveform } from "./radarModel.ts";

/** True when x is a finite number > 0. */
function isPositive(x: number): boolean {
  return Number.isFinite(x) && x > 0;
}

/** True when a count of pulses or chirps is finite and ≥ 1. */
function isCount(n: number): boolean {
  return Number.isFinite(n) && n >= 1;
}

/**
 * Transmitter-on time of one pulse or one chirp ramp, s: the pulse width (pulsed) or the chirp
 * ramp duration (FMCW). This is the τ of the single-pulse radar equation.
 * @param w waveform; pulseWidthS or chirpDurationS, s, finite > 0.
 * @returns seconds; NaN when the duration is zero, negative, infinite or NaN.
 * Reference: τ in the energy P_t·τ of one pulse (Skolnik, Introduction to Radar Systems, 3rd ed., 2001,
 * ch. 2, from memory, equation number not checked); for FMCW the transmitter-on time of the ramp
 * (common practice).
 */
export function pulseDurationS(w: Waveform): number {
  const t = w.kind === "pulsed" ? w.pulseWidthS : w.chirpDurationS;
  return isPositive(t) ? t : Number.NaN;
}

/**
 * Pulses (pulsed) or chirps (FMCW) integrated coherently in one look, ≥ 1.
 * @param w waveform; pulsesIntegrated or chirpsPerFrame, a count, finite ≥ 1 (not required to be an
 *   integer here: validation at the edge enforces it).
 * @returns the count, dimensionless; NaN when it is below 1 (including 0 and negative), infinite or NaN.
 * Reference: N of the coherent-integration gain N·SNR_1 (Richards, Fundamentals of Radar Signal
 * Processing, 2nd ed., 2014, ch. 1–2, from memory, section and equation numbers not checked; common practice).
 */
export function coherentPulseCount(w: Waveform): number {
  const n = w.kind === "pulsed" ? w.pulsesIntegrated : w.chirpsPerFrame;
  return isCount(n) ? n : Number.NaN;
}

/**
 * Repetition period of the waveform, s: the PRI = 1/PRF (pulsed) or the chirp period (FMCW).
 * @param w waveform; prfHz, Hz, finite > 0 (pulsed) or chirpPeriodS, s, finite > 0 (FMCW).
 * @returns seconds; NaN for a zero, negative, infinite or NaN PRF or chirp period.
 * Reference: PRI = 1/PRF by definition (common practice).
 */
export function repetitionPeriodS(w: Waveform): number {
  if (w.kind === "pulsed") return isPositive(w.prfHz) ? 1 / w.prfHz : Number.NaN;
  return isPositive(w.chirpPeriodS) ? w.chirpPeriodS : Number.NaN;
}

/**
 * Coherent integration time of one look, s: T_int = N · PRI (pulsed) or N · T_chirp-period (FMCW)
 * (DESIGN.md model step 4).
 * @param w waveform; count ≥ 1 and PRF (Hz > 0) or chirp period (s > 0) as coherentPulseCount and
 *   repetitionPeriodS.
 * @returns seconds; NaN when the count or period is out of domain.
 * Reference: the dwell (CPI) of N pulses is N·PRI (common practice; Richards, Fundamentals of Radar
 * Signal Processing, 2nd ed., 2014, ch. 1, from memory, section and equation numbers not checked).
 */
export function coherentIntegrationTimeS(w: Waveform): number {
  return coherentPulseCount(w) * repetitionPeriodS(w);
}

/**
 * Transmit duty cycle, dimensionless in (0, 1]: τ · PRF (pulsed) or T_ramp / T_period (FMCW).
 * A duty cycle above 1 (pulse longer than its PRI, ramp longer than its period) is returned as it is
 * computed so that validation can name it; it is not physical.
 * @param w waveform; pulse width (s > 0) and PRF (Hz > 0), or chirp ramp (s > 0) and chirp period (s > 0).
 * @returns ratio, dimensionless; NaN when an input is zero, negative, infinite or NaN.
 * Reference: duty cycle = τ·f_p = P_av/P_t (common practice; Skolnik, Introduction to Radar Systems,
 * 3rd ed., 2001, ch. 2, from memory, equation number not checked).
 */
export function dutyCycle(w: Waveform): number {
  return pulseDurationS(w) / repetitionPeriodS(w);
}

/**
 * Average transmitted power, W: P_avg = P_peak · duty cycle (Skolnik, Introduction to Radar Systems,
 * 3rd ed., 2001, P_av = P_t·τ·f_p: ch. 2, transmitter power, from memory — section and equation
 * number not checked).
 * @param peakPowerW peak power at the antenna port, W ≥ 0 (0 gives 0; +Infinity gives +Infinity).
 * @param w waveform; as dutyCycle.
 * @returns watts; NaN when peakPowerW < 0 or NaN, or the waveform is out of domain.
 */
export function averagePowerW(peakPowerW: number, w: Waveform): number {
  if (!(peakPowerW >= 0)) return Number.NaN;
  return peakPowerW * dutyCycle(w);
}

/**
 * Transmitted energy in one look, J: E = P_peak · τ · N = P_avg · T_int. The numerator of the energy
 * form of the radar equation (DESIGN.md step 4); the same expression serves pulsed and FMCW radars.
 * @param peakPowerW peak (CW, for FMCW) power at the antenna port, W ≥ 0 (0 gives 0 J).
 * @param w waveform; duration (s > 0) and count (≥ 1) as pulseDurationS and coherentPulseCount.
 * @returns joules; NaN when peakPowerW < 0 or NaN, or the waveform is out of domain.
 * Reference: energy form of the radar equation, E = P_t·τ·N (Barton, Radar Equations for Modern Radar,
 * 2013, ch. 1, from memory, equation number not checked; common practice).
 */
export function energyPerLookJ(peakPowerW: number, w: Waveform): number {
  if (!(peakPowerW >= 0)) return Number.NaN;
  return peakPowerW * pulseDurationS(w) * coherentPulseCount(w);
}

/**
 * Swept (or signal) bandwidth, Hz: the compressed-pulse bandwidth when given, else 1/τ for an
 * unmodulated pulse (common practice); the chirp bandwidth for FMCW.
 * @param w waveform; pulsed: optional bandwidthHz, Hz, finite > 0, else pulseWidthS, s, finite > 0;
 *   FMCW: chirpBandwidthHz, Hz, finite > 0.
 * @returns hertz; NaN when the bandwidth used is zero, negative, infinite or NaN (a bad bandwidthHz
 *   gives NaN even when the pulse width is valid; no fallback to 1/τ).
 * Reference: B ≈ 1/τ for a simple pulse (common practice).
 */
export function signalBandwidthHz(w: Waveform): number {
  if (w.kind === "fmcw") return isPositive(w.chirpBandwidthHz) ? w.chirpBandwidthHz : Number.NaN;
  if (w.bandwidthHz !== undefined) return isPositive(w.bandwidthHz) ? w.bandwidthHz : Number.NaN;
  return 1 / pulseDurationS(w);
}

/**
 * Range resolution, m: ΔR = c / (2B) (common practice; B = 1 GHz gives 0.15 m).
 * @param w waveform; bandwidth as signalBandwidthHz (Hz > 0; for an uncompressed pulse B = 1/τ, so
 *   ΔR = c·τ/2).
 * @returns metres > 0; NaN when the bandwidth is zero, negative, infinite or NaN.
 * Reference: ΔR = c/(2B) (common practice; Richards, Fundamentals of Radar Signal Processing, 2nd ed.,
 * 2014, ch. 4, from memory, section and equation numbers not checked).
 */
export function rangeResolutionM(w: Waveform): number {
  return SPEED_OF_LIGHT_M_PER_S / (2 * signalBandwidthHz(w));
}

/**
 * Receiver noise bandwidth, Hz, used only to present the link budget in the bandwidth form
 * (noise k·T0·B·F against a processing gain B·τ·N; B cancels in the SNR).
 * Pulsed: the matched-filter bandwidth, taken as the signal bandwidth (compressed or 1/τ).
 * FMCW: the IF bandwidth the ADC resolves, f_s (complex I/Q sampling) or f_s/2 (real sampling).
 * @param w waveform; pulsed as signalBandwidthHz; FMCW as maxBeatFrequencyHz (ifSampleRateHz > 0).
 * @returns hertz; NaN when out of domain.
 * Reference: the matched-filter noise bandwidth of a pulse is about 1/τ (common practice); the IF band
 * of an FMCW receiver is set by the sampling rate (Nyquist; common practice).
 */
export function noiseBandwidthHz(w: Waveform): number {
  if (w.kind === "pulsed") return signalBandwidthHz(w);
  return maxBeatFrequencyHz(w);
}

/**
 * FMCW chirp slope, Hz/s: S = B / T_ramp.
 * @param w FMCW waveform; chirpBandwidthHz, Hz, finite > 0; chirpDurationS, s, finite > 0.
 * @returns Hz/s > 0; NaN when either is zero, negative, infinite or NaN.
 * Reference: slope of a linear frequency ramp (common practice; Iovescu & Rao, "The fundamentals of
 * millimeter wave sensors", TI SPYY005, 2017, from memory, equations unnumbered there as recalled).
 */
export function chirpSlopeHzPerS(w: FmcwWaveform): number {
  if (!isPositive(w.chirpBandwidthHz)) return Number.NaN;
  return w.chirpBandwidthHz / pulseDurationS(w);
}

/**
 * Largest beat (IF) frequency the FMCW receiver resolves, Hz: f_s for complex (I/Q) sampling,
 * f_s/2 for real sampling (Nyquist; common practice).
 * @param w FMCW waveform; ifSampleRateHz, Hz, finite > 0; ifSampling "complex" or "real" (anything
 *   other than "complex" is taken as real).
 * @returns hertz; NaN for a zero, negative, infinite or NaN sample rate.
 */
export function maxBeatFrequencyHz(w: FmcwWaveform): number {
  if (!isPositive(w.ifSampleRateHz)) return Number.NaN;
  return w.ifSampling === "complex" ? w.ifSampleRateHz : w.ifSampleRateHz / 2;
}

/**
 * FMCW maximum range set by the IF sampling, m: R_max = f_b,max · c / (2 · S), with S the chirp slope
 * (beat frequency f_b = 2·R·S/c; Iovescu & Rao, "The fundamentals of millimeter wave sensors",
 * TI SPYY005, 2017, from memory; equations unnumbered there as recalled).
 * @param w FMCW waveform; ifSampleRateHz, Hz > 0; chirpBandwidthHz, Hz > 0; chirpDurationS, s > 0
 *   (all finite). Real sampling halves the range.
 * @returns metres > 0; NaN when any of the three is zero, negative, infinite or NaN.
 */
export function fmcwMaxRangeM(w: FmcwWaveform): number {
  return (maxBeatFrequencyHz(w) * SPEED_OF_LIGHT_M_PER_S) / (2 * chirpSlopeHzPerS(w));
}

/**
 * Unambiguous range of a pulsed waveform, m: R_u = c / (2 · PRF) (Skolnik, Introduction to Radar
 * Systems, 3rd ed., 2001, §1.1, eq. (1.2); equation number from memory).
 * Informational: the model's instrumented limit is maxInstrumentedRangeM (a radar may resolve ambiguities).
 * @param w waveform; pulsed prfHz, Hz, finite > 0.
 * @returns metres; NaN for a zero, negative, infinite or NaN PRF, and for FMCW (whose limit is fmcwMaxRangeM).
 */
export function unambiguousRangeM(w: Waveform): number {
  if (w.kind !== "pulsed") return Number.NaN;
  return (SPEED_OF_LIGHT_M_PER_S * repetitionPeriodS(w)) / 2;
}

/** Carrier wavelength λ = c/f, m: defined once, in propagation.ts, and re-exported here for waveform users. */
export { wavelengthM };

/**
 * Velocity (Doppler) resolution of one look, m/s: Δv = λ / (2 · T_int), from the Doppler resolution
 * 1/T_int of a T_int-long dwell (Richards, Fundamentals of Radar Signal Processing, 2nd ed., 2014,
 * ch. 5, Doppler processing; from memory, section and equation numbers not checked) and the Doppler
 * shift f_d = 2·v_r/λ (Skolnik, Introduction to Radar Systems, 3rd ed., 2001, §3.1; from memory,
 * equation number not checked); the same formula in TI SPYY005, 2017 (from memory).
 * @param w waveform; count and period as coherentIntegrationTimeS.
 * @param frequencyHz carrier frequency, Hz, finite > 0.
 * @returns m/s > 0; NaN when the frequency, count or period is out of domain.
 */
export function velocityResolutionMPerS(w: Waveform, frequencyHz: number): number {
  return wavelengthM(frequencyHz) / (2 * coherentIntegrationTimeS(w));
}

/**
 * Maximum unambiguous radial velocity, m/s (±): λ · PRF / 4 (pulsed) or λ / (4 · T_chirp-period)
 * (FMCW), from the Doppler sampled once per pulse or chirp, |f_d| < PRF/2 with f_d = 2·v_r/λ
 * (Skolnik, Introduction to Radar Systems, 3rd ed., 2001, ch. 3, blind speeds and Doppler ambiguity;
 * from memory, section and equation numbers not checked; the same formula in TI SPYY005, 2017, from memory).
 * @param w waveform; PRF (Hz > 0) or chirp period (s > 0) as repetitionPeriodS.
 * @param frequencyHz carrier frequency, Hz, finite > 0.
 * @returns m/s > 0 (the bound is ±); NaN when the frequency or period is out of domain.
 */
export function maxUnambiguousVelocityMPerS(w: Waveform, frequencyHz: number): number {
  return wavelengthM(frequencyHz) / (4 * repetitionPeriodS(w));
}

/**
 * Blind zone, m: the nearest range at which the radar can detect. Pulsed: at least c·τ/2, the range
 * over which the echo overlaps the transmitted pulse (Skolnik, Introduction to Radar Systems, 3rd ed.,
 * 2001, §1.1; from memory, equation number not checked; R_min = c·τ/2 is common practice), or the
 * model's blindZoneM when that is larger (blanking, near field). FMCW: the model's blindZoneM.
 * @param w waveform; pulsed pulseWidthS, s, finite > 0 (unused for FMCW).
 * @param modelBlindZoneM RadarModel.blindZoneM, m ≥ 0 (0 leaves only c·τ/2).
 * @returns metres ≥ 0; NaN for modelBlindZoneM < 0 or NaN, or (pulsed) a pulse width out of domain.
 */
export function blindZoneM(w: Waveform, modelBlindZoneM: number): number {
  if (!(modelBlindZoneM >= 0)) return Number.NaN;
  if (w.kind === "fmcw") return modelBlindZoneM;
  return Math.max((SPEED_OF_LIGHT_M_PER_S * pulseDurationS(w)) / 2, modelBlindZoneM);
}

/**
 * Instrumented range window [minM, maxM], m: from the blind zone to the smaller of the model's
 * maximum instrumented range and (FMCW) the IF-sampling limit. Outside it the radar does not detect.
 * @param model the radar's waveform (as blindZoneM and fmcwMaxRangeM), blindZoneM (m ≥ 0) and
 *   maxInstrumentedRangeM (m, finite > 0).
 * @returns metres; a field is NaN when its inputs are out of domain (minM as blindZoneM; maxM NaN for a
 *   zero, negative, infinite or NaN maxInstrumentedRangeM, or an FMCW waveform out of domain). minM > maxM
 *   is returned as computed (an empty window) for validation to name.
 * Reference: a composition of blindZoneM and fmcwMaxRangeM with the model's stated limit (common practice).
 */
export function instrumentedRangeM(model: {
  waveform: Waveform;
  blindZoneM: number;
  maxInstrumentedRangeM: number;
}): { minM: number; maxM: number } {
  const minM = blindZoneM(model.waveform, model.blindZoneM);
  const maxInstrumented = isPositive(model.maxInstrumentedRangeM) ? model.maxInstrumentedRangeM : Number.NaN;
  const maxM =
    model.waveform.kind === "fmcw"
      ? Math.min(maxInstrumented, fmcwMaxRangeM(model.waveform))
      : maxInstrumented;
  return { minM, maxM };
}
