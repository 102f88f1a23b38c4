/**
 * The radar model: the parameters of one radar type as the model uses them.
 * Types only. The file format (validation, defaults, error paths) lives in src/io/radarSchema.ts
 * and produces exactly this shape. All quantities carry SI units in their names.
 */

/** A measured pattern cut: angle off boresight in degrees (ascending, within [-180, 180]) and gain relative to peak in dB (≤ 0). */
export interface PatternCut {
  angleDeg: number[];
  relativeGainDb: number[];
}

/** Main-beam shape of an antenna. */
export type MainBeamShape = "gaussian" | "sinc2";

export interface AntennaSpec {
  /** Peak gain, dBi. */
  peakGainDbi: number;
  /** Half-power (−3 dB) beamwidth in azimuth, degrees (0, 360]. */
  azBeamwidthDeg: number;
  /** Half-power (−3 dB) beamwidth in elevation, degrees (0, 180]. */
  elBeamwidthDeg: number;
  /** Sidelobe floor relative to peak, dB (≤ 0, e.g. −25). The pattern never falls below it. */
  sidelobeFloorDb: number;
  /** Main-beam shape used when no measured cut is given. */
  mainBeam: MainBeamShape;
  /** Optional measured azimuth cut; replaces the analytic azimuth shape. */
  azCut?: PatternCut;
  /** Optional measured elevation cut; replaces the analytic elevation shape. */
  elCut?: PatternCut;
}

/** Pulsed waveform: coherent integration of `pulsesIntegrated` pulses at `prfHz`. */
export interface PulsedWaveform {
  kind: "pulsed";
  /** Transmitted pulse length, s. */
  pulseWidthS: number;
  /** Pulse repetition frequency, Hz. */
  prfHz: number;
  /** Pulses integrated coherently in one look (one dwell), ≥ 1. */
  pulsesIntegrated: number;
  /** Swept bandwidth of a compressed pulse, Hz; without it the bandwidth is 1/pulseWidthS. */
  bandwidthHz?: number;
}

/** FMCW waveform: linear chirps, `chirpsPerFrame` integrated coherently in one look. */
export interface FmcwWaveform {
  kind: "fmcw";
  /** Swept bandwidth of one chirp, Hz. */
  chirpBandwidthHz: number;
  /** Duration of the frequency ramp of one chirp, s (transmitter on). */
  chirpDurationS: number;
  /** Chirp repetition period (ramp plus reset/idle), s, ≥ chirpDurationS. */
  chirpPeriodS: number;
  /** Chirps integrated coherently in one look (one frame), ≥ 1. */
  chirpsPerFrame: number;
  /** ADC sample rate of the IF (beat) signal, Hz. */
  ifSampleRateHz: number;
  /** Real sampling resolves beat frequencies up to fs/2, complex (I/Q) up to fs. */
  ifSampling: "real" | "complex";
}

export type Waveform = PulsedWaveform | FmcwWaveform;

/** How the radar covers azimuth. Azimuths are clockwise from true north, sectors as centre (boresight) and width. */
export type ScanMode =
  /** Fixed antenna: the pattern alone limits coverage around boresight; fovAzDeg bounds the instrumented sector. */
  | { kind: "staring"; fovAzDeg: number; fovElDeg: number }
  /** Mechanically or electronically scanned over a sector centred on boresight; peak azimuth gain inside it. */
  | { kind: "sector"; sectorWidthDeg: number; fovElDeg: number }
  /** Rotating through 360°; peak azimuth gain on every bearing. */
  | { kind: "rotating"; fovElDeg: number };

export interface RadarModel {
  /** Stable identifier used by posts to refer to it. */
  id: string;
  /** Display name. */
  name: string;
  /** True for the invented example models shipped with Picket. */
  invented?: boolean;
  /** Carrier (centre) frequency, Hz. */
  frequencyHz: number;
  transmitter: {
    /** Peak transmitted power at the antenna port, W. */
    peakPowerW: number;
  };
  receiver: {
    /** Receiver noise figure F_n, dB; T_s = T0 · F_n. */
    noiseFigureDb: number;
    /** Two-way system losses (RF, processing, beam-shape), dB ≥ 0. */
    systemLossDb: number;
  };
  waveform: Waveform;
  /** Transmit antenna. */
  txAntenna: AntennaSpec;
  /** Receive antenna; when absent, the transmit antenna is used for both. */
  rxAntenna?: AntennaSpec;
  scan: ScanMode;
  /** Time between looks at the same cell (revisit / frame period), s. */
  updateIntervalS: number;
  /** Looks integrated non-coherently before a detection decision, ≥ 1 (default 1). */
  looksIntegrated?: number;
  /** Nearest range at which the radar detects (transmit blanking, near-field), m. */
  blindZoneM: number;
  /** Maximum instrumented range set by the processing, m. */
  maxInstrumentedRangeM: number;
  /** MTI / Doppler clutter improvement factor, dB ≥ 0 (for the optional clutter model). */
  clutterImprovementDb?: number;
}
