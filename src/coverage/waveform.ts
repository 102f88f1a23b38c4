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
 * @param w waveform; pulseWidthS or chirpDurationS > 0.
 * @returns seconds; NaN when the duration is not a finite positive number.
 */
export function pulseDurationS(w: Waveform): number {
  const t = w.kind === "pulsed" ? w.pulseWidthS : w.chirpDurationS;
  return isPositive(t) ? t : Number.NaN;
}

/**
 * Pulses (pulsed) or chirps (FMCW) integrated coherently in one look, ≥ 1.
 * @returns the count; NaN when it is below 1 or not finite.
 */
export function coherentPulseCount(w: Waveform): number {
  const n = w.kind === "pulsed" ? w.pulsesIntegrated : w.chirpsPerFrame;
  return isCount(n) ? n : Number.NaN;
}

/**
 * Repetition period of the waveform, s: the PRI = 1/PRF (pulsed) or the chirp period (FMCW).
 * @returns seconds; NaN for a non-positive PRF or chirp period.
 */
export function repetitionPeriodS(w: Waveform): number {
  if (w.kind === "pulsed") return isPositive(w.prfHz) ? 1 / w.prfHz : Number.NaN;
  return isPositive(w.chirpPeriodS) ? w.chirpPeriodS : Number.NaN;
}

/**
 * Coherent integration time of one look, s: T_int = N · PRI (pulsed) or N · T_chirp-period (FMCW)
 * (DESIGN.md model step 4; Richards, Fundamentals of Radar Signal Processing, 2nd ed., Sec. 1.4, from memory).
 * @returns seconds; NaN when the count or period is out of domain.
 */
export function coherentIntegrationTimeS(w: Waveform): number {
  return coherentPulseCount(w) * repetitionPeriodS(w);
}

/**
 * Transmit duty cycle, dimensionless in (0, 1]: τ · PRF (pulsed) or T_ramp / T_period (FMCW).
 * A duty cycle above 1 (pulse longer than its PRI, ramp longer than its period) is returned as it is
 * computed so that validation can name it; it is not physical.
 * @returns ratio; NaN when an input is out of domain.
 */
export function dutyCycle(w: Waveform): number {
  return pulseDurationS(w) / repetitionPeriodS(w);
}

/**
 * Average transmitted power, W: P_avg = P_peak · duty cycle (Skolnik, Introduction to Radar Systems,
 * 3rd ed., Sec. 1.2, P_av = P_t·τ·f_p, from memory).
 * @param peakPowerW peak power at the antenna port, W ≥ 0.
 * @returns watts; NaN when peakPowerW < 0 or the waveform is out of domain.
 */
export function averagePowerW(peakPowerW: number, w: Waveform): number {
  if (!(peakPowerW >= 0)) return Number.NaN;
  return peakPowerW * dutyCycle(w);
}

/**
 * Transmitted energy in one look, J: E = P_peak · τ · N = P_avg · T_int. The numerator of the energy
 * form of the radar equation (DESIGN.md step 4); the same expression serves pulsed and FMCW radars.
 * @param peakPowerW peak (CW, for FMCW) power at the antenna port, W ≥ 0.
 * @returns joules; NaN when an input is out of domain.
 */
export function energyPerLookJ(peakPowerW: number, w: Waveform): number {
  if (!(peakPowerW >= 0)) return Number.NaN;
  return peakPowerW * pulseDurationS(w) * coherentPulseCount(w);
}

/**
 * Swept (or signal) bandwidth, Hz: the compressed-pulse bandwidth when given, else 1/τ for an
 * unmodulated pulse (common practice); the chirp bandwidth for FMCW.
 * @returns hertz; NaN when out of domain.
 */
export function signalBandwidthHz(w: Waveform): number {
  if (w.kind === "fmcw") return isPositive(w.chirpBandwidthHz) ? w.chirpBandwidthHz : Number.NaN;
  if (w.bandwidthHz !== undefined) return isPositive(w.bandwidthHz) ? w.bandwidthHz : Number.NaN;
  return 1 / pulseDurationS(w);
}

/**
 * Range resolution, m: ΔR = c / (2B) (common practice; B = 1 GHz gives 0.15 m).
 * @returns metres; NaN when the bandwidth is out of domain.
 */
export function rangeResolutionM(w: Waveform): number {
  return SPEED_OF_LIGHT_M_PER_S / (2 * signalBandwidthHz(w));
}

/**
 * Receiver noise bandwidth, Hz, used only to present the link budget in the bandwidth form
 * (noise k·T0·B·F against a processing gain B·τ·N; B cancels in the SNR).
 * Pulsed: the matched-filter bandwidth, taken as the signal bandwidth (compressed or 1/τ).
 * FMCW: the IF bandwidth the ADC resolves, f_s (complex I/Q sampling) or f_s/2 (real sampling).
 * @returns hertz; NaN when out of domain.
 */
export function noiseBandwidthHz(w: Waveform): number {
  if (w.kind === "pulsed") return signalBandwidthHz(w);
  return maxBeatFrequencyHz(w);
}

/**
 * FMCW chirp slope, Hz/s: S = B / T_ramp.
 * @returns Hz/s; NaN when out of domain.
 */
export function chirpSlopeHzPerS(w: FmcwWaveform): number {
  if (!isPositive(w.chirpBandwidthHz)) return Number.NaN;
  return w.chirpBandwidthHz / pulseDurationS(w);
}

/**
 * Largest beat (IF) frequency the FMCW receiver resolves, Hz: f_s for complex (I/Q) sampling,
 * f_s/2 for real sampling (Nyquist; common practice).
 * @returns hertz; NaN for a non-positive sample rate.
 */
export function maxBeatFrequencyHz(w: FmcwWaveform): number {
  if (!isPositive(w.ifSampleRateHz)) return Number.NaN;
  return w.ifSampling === "complex" ? w.ifSampleRateHz : w.ifSampleRateHz / 2;
}

/**
 * FMCW maximum range set by the IF sampling, m: R_max = f_b,max · c / (2 · S), with S the chirp slope
 * (beat frequency f_b = 2·R·S/c; Iovescu & Rao, "The fundamentals of millimeter wave sensors",
 * TI SPYY005, 2017, from memory).
 * @returns metres; NaN when out of domain.
 */
export function fmcwMaxRangeM(w: FmcwWaveform): number {
  return (maxBeatFrequencyHz(w) * SPEED_OF_LIGHT_M_PER_S) / (2 * chirpSlopeHzPerS(w));
}

/**
 * Unambiguous range of a pulsed waveform, m: R_u = c / (2 · PRF) (Skolnik, 3rd ed., Sec. 1.1, from memory).
 * Informational: the model's instrumented limit is maxInstrumentedRangeM (a radar may resolve ambiguities).
 * @returns metres; NaN for a non-positive PRF, and for FMCW (whose limit is fmcwMaxRangeM).
 */
export function unambiguousRangeM(w: Waveform): number {
  if (w.kind !== "pulsed") return Number.NaN;
  return (SPEED_OF_LIGHT_M_PER_S * repetitionPeriodS(w)) / 2;
}

/**
 * Carrier wavelength, m: λ = c / f.
 * @param frequencyHz carrier frequency, Hz > 0.
 * @returns metres; NaN for a non-positive or NaN frequency.
 */
export function wavelengthM(frequencyHz: number): number {
  return isPositive(frequencyHz) ? SPEED_OF_LIGHT_M_PER_S / frequencyHz : Number.NaN;
}

/**
 * Velocity (Doppler) resolution of one look, m/s: Δv = λ / (2 · T_int) (Doppler resolution 1/T_int,
 * f_d = 2v/λ; TI SPYY005, 2017, from memory).
 * @param frequencyHz carrier frequency, Hz > 0.
 * @returns m/s; NaN when out of domain.
 */
export function velocityResolutionMPerS(w: Waveform, frequencyHz: number): number {
  return wavelengthM(frequencyHz) / (2 * coherentIntegrationTimeS(w));
}

/**
 * Maximum unambiguous radial velocity, m/s (±): λ · PRF / 4 (pulsed) or λ / (4 · T_chirp-period)
 * (FMCW), from the Doppler sampled once per pulse or chirp, |f_d| < PRF/2 (TI SPYY005, 2017, from memory).
 * @param frequencyHz carrier frequency, Hz > 0.
 * @returns m/s; NaN when out of domain.
 */
export function maxUnambiguousVelocityMPerS(w: Waveform, frequencyHz: number): number {
  return wavelengthM(frequencyHz) / (4 * repetitionPeriodS(w));
}

/**
 * Blind zone, m: the nearest range at which the radar can detect. Pulsed: at least c·τ/2, the range
 * over which the echo overlaps the transmitted pulse (Skolnik, 3rd ed., Sec. 1.1, from memory), or the
 * model's blindZoneM when that is larger (blanking, near field). FMCW: the model's blindZoneM.
 * @param modelBlindZoneM RadarModel.blindZoneM, m ≥ 0.
 * @returns metres; NaN when out of domain.
 */
export function blindZoneM(w: Waveform, modelBlindZoneM: number): number {
  if (!(modelBlindZoneM >= 0)) return Number.NaN;
  if (w.kind === "fmcw") return modelBlindZoneM;
  return Math.max((SPEED_OF_LIGHT_M_PER_S * pulseDurationS(w)) / 2, modelBlindZoneM);
}

/**
 * Instrumented range window [minM, maxM], m: from the blind zone to the smaller of the model's
 * maximum instrumented range and (FMCW) the IF-sampling limit. Outside it the radar does not detect.
 * @param model the radar's waveform, blindZoneM and maxInstrumentedRangeM (m > 0).
 * @returns metres; a field is NaN when its inputs are out of domain.
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
