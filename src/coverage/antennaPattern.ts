/**
 * Antenna patterns: gain towards an azimuth and elevation from a peak gain, two half-power beamwidths,
 * a main-beam shape (Gaussian or uniform-aperture sinc²) or measured cuts, and a sidelobe floor; then the
 * scan mode (staring, sector, rotating), boresight azimuth and tilt that point it.
 *
 * The pattern is separable in azimuth and elevation offsets, G(Δaz, Δel) = G0 · f_az(Δaz) · f_el(Δel),
 * floored at the sidelobe level: the usual planning approximation, good near the horizon where
 * surveillance radars look (Barton, Radar System Analysis and Modeling, 2005, ch. 3, from memory).
 * Sidelobes are not modelled one by one; the floor stands for them. Angles in degrees; azimuths clockwise
 * from true north; elevation and tilt positive up. Rules AP1–AP7 in docs/model-spec.md (gain estimates: AP8, antennaGain.ts).
 *
 * Kernels are total: NaN in gives NaN out; no throw.
 */

import { SINC2_HALF_POWER_ARGUMENT } from "./constants.ts";
import type { AntennaSpec, MainBeamShape, PatternCut, ScanMode } from "./radarModel.ts";
import { dbToLinear, linearToDb, wrapDeg180 } from "./units.ts";

/** Half power as a ratio, and the Gaussian exponent 4·ln 2 that puts it at ± half the beamwidth. */
const HALF_POWER_DB = linearToDb(2);
const GAUSSIAN_LN_EXPONENT = 4 * Math.LN2;

/**
 * One-dimensional main-beam shape relative to peak, dB (no floor applied), with the half-power points at
 * ± beamwidthDeg/2 exactly:
 *  - "gaussian": f = exp(−4 ln2 · (θ/θ3)²), i.e. −10·log10(2)·4·(θ/θ3)² dB (the Gaussian main-beam
 *    approximation, common practice);
 *  - "sinc2": uniform aperture f = (sin u / u)², u = 1.39156 · θ / (θ3/2) (Balanis, Antenna Theory,
 *    4th ed., 2016, §12.5.1 uniform rectangular aperture and Table 12.1, whose E- and H-plane factors
 *    are sin X / X; section and table numbers from memory), main lobe only: −Infinity at and beyond
 *    the first null u = π.
 * @param offDeg angle off the beam axis, degrees (any sign; the shape is symmetric).
 * @param beamwidthDeg half-power beamwidth, degrees > 0.
 * @returns dB ≤ 0 (may be −Infinity); NaN for NaN or a non-positive beamwidth.
 */
export function mainBeamRelativeDb(shape: MainBeamShape, offDeg: number, beamwidthDeg: number): number {
  if (!(beamwidthDeg > 0)) return Number.NaN;
  const x = offDeg / beamwidthDeg;
  if (shape === "gaussian") return x === 0 ? 0 : -4 * HALF_POWER_DB * x * x;
  const u = 2 * SINC2_HALF_POWER_ARGUMENT * Math.abs(x);
  if (Number.isNaN(u)) return Number.NaN;
  if (u >= Math.PI) return Number.NEGATIVE_INFINITY;
  if (u === 0) return 0;
  const s = Math.sin(u) / u;
  return linearToDb(s * s);
}

/** Index i with angleDeg[i] ≤ a < angleDeg[i+1], for a inside [first, last). Binary search. */
function segmentIndex(angleDeg: ArrayLike<number>, a: number): number {
  let lo = 0;
  let hi = angleDeg.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (angleDeg[mid] <= a) lo = mid;
    else hi = mid;
  }
  return lo;
}

/**
 * A measured cut at an angle, dB relative to peak, interpolated linearly in dB between samples
 * (no floor applied). Outside the measured span the value is −Infinity (the caller floors it).
 * @param cut angles ascending in [−180, 180] (deg) with their relative gains (dB ≤ 0); ≥ 1 sample.
 * @param offDeg signed angle off boresight, degrees (positive clockwise in azimuth, up in elevation).
 * @returns dB; −Infinity outside the span; NaN for NaN or an empty cut.
 * Reference: a measured principal-plane cut, as tabulated in an antenna data sheet, read by piecewise-
 * linear interpolation in dB (common practice; the use of two principal-plane cuts for the whole pattern
 * is the separable approximation of the module header).
 */
export function cutRelativeDb(cut: PatternCut, offDeg: number): number {
  const a = cut.angleDeg;
  const g = cut.relativeGainDb;
  const n = Math.min(a.length, g.length);
  if (n === 0 || Number.isNaN(offDeg)) return Number.NaN;
  if (offDeg < a[0] || offDeg > a[n - 1]) return Number.NEGATIVE_INFINITY;
  if (n === 1 || offDeg === a[n - 1]) return g[n - 1];
  const i = segmentIndex(a, offDeg);
  const span = a[i + 1] - a[i];
  if (!(span > 0)) return g[i];
  const t = (offDeg - a[i]) / span;
  return g[i] + t * (g[i + 1] - g[i]);
}

/** The azimuth (or elevation) factor of an antenna in dB, from its measured cut or its analytic shape. */
function axisRelativeDb(antenna: AntennaSpec, axis: "az" | "el", offDeg: number): number {
  const cut = axis === "az" ? antenna.azCut : antenna.elCut;
  if (cut !== undefined) return cutRelativeDb(cut, offDeg);
  return mainBeamRelativeDb(
    antenna.mainBeam,
    offDeg,
    axis === "az" ? antenna.azBeamwidthDeg : antenna.elBeamwidthDeg,
  );
}

/**
 * Antenna gain relative to its peak towards an offset from boresight, dB:
 * max(floor, f_az(Δaz) + f_el(Δel)) with each factor from the measured cut when given, else the main-beam
 * shape (mainBeamRelativeDb). Azimuth offsets are wrapped to (−180, 180].
 * @param antenna peak gain, beamwidths (deg > 0), floor (dB ≤ 0), shape, optional cuts.
 * @param azOffDeg azimuth offset from boresight, degrees, positive clockwise (any real; wrapped).
 * @param elOffDeg elevation offset from the beam axis (tilt), degrees, positive up (not wrapped;
 *   meaningful in [−180, 180]).
 * @returns dB in [sidelobeFloorDb, 0] for analytic beams and cuts ≤ 0 dB (beyond the first null of a
 *   sinc² beam or outside a cut's span: the floor); NaN for NaN inputs or a non-positive beamwidth.
 * Reference: separable pattern G = G0·f_az·f_el floored at a sidelobe level (Barton, Radar System
 * Analysis and Modeling, 2005, ch. 3, from memory; section and equation numbers not checked); the
 * factors as in mainBeamRelativeDb (Gaussian: common practice; sinc²: Balanis 4th ed. §12.5.1, from memory).
 */
export function relativeGainDb(antenna: AntennaSpec, azOffDeg: number, elOffDeg: number): number {
  const sum = axisRelativeDb(antenna, "az", wrapDeg180(azOffDeg)) + axisRelativeDb(antenna, "el", elOffDeg);
  if (Number.isNaN(sum)) return Number.NaN;
  return Math.max(antenna.sidelobeFloorDb, sum);
}

/**
 * Antenna gain towards an offset from boresight, dBi: G(Δaz, Δel) = G0 + relativeGainDb(antenna, Δaz, Δel).
 * @param antenna peak gain G0, dBi (finite; any real), half-power beamwidths in degrees (az in (0, 360],
 *   el in (0, 180]), sidelobe floor in dB ≤ 0, main-beam shape, optional measured cuts.
 * @param azOffDeg azimuth offset from boresight, degrees, positive clockwise (any real; wrapped to (−180, 180]).
 * @param elOffDeg elevation offset from the beam axis (tilt), degrees, positive up (not wrapped;
 *   meaningful in [−180, 180]).
 * @returns dBi in [G0 + sidelobeFloorDb, G0] for analytic beams and cuts ≤ 0 dB; NaN for NaN inputs or a non-positive beamwidth.
 * Reference: gain = peak gain × relative pattern (Balanis, Antenna Theory, 4th ed., ch. 2, gain and
 * directivity; from memory, section and equation numbers not checked); pattern as in relativeGainDb.
 */
export function gainDbi(antenna: AntennaSpec, azOffDeg: number, elOffDeg: number): number {
  return antenna.peakGainDbi + relativeGainDb(antenna, azOffDeg, elOffDeg);
}

/** An antenna as mounted on a post: its pattern, how it scans, where it points. */
export interface AntennaPointing {
  antenna: AntennaSpec;
  scan: ScanMode;
  /** Boresight (sector centre) azimuth, degrees clockwise from true north. */
  boresightAzDeg: number;
  /** Beam-axis elevation (tilt), degrees, positive up. */
  tiltDeg: number;
}

/** Where a direction falls for a scan mode: the azimuth offset the pattern sees and the field-of-view flags. */
export interface ScanGeometry {
  /** Target azimuth minus boresight, wrapped to (−180, 180], degrees. */
  azOffDeg: number;
  /** Target elevation minus tilt, degrees. */
  elOffDeg: number;
  /** Azimuth offset that enters the pattern after scanning (0 inside a sector or for a rotating radar), degrees. */
  patternAzOffDeg: number;
  /** Inside the nominal coverage: staring FOV (az and el), sector (az and el FOV), rotating (el FOV). */
  inSector: boolean;
  /** The radar processes returns from here: false outside a staring FOV or outside any elevation FOV. */
  instrumented: boolean;
}

/**
 * Scan geometry of a direction: offsets from boresight and tilt, the azimuth offset the pattern sees,
 * and whether the direction is inside the sector and instrumented.
 *  - staring: the pattern at Δaz; instrumented only within |Δaz| ≤ fovAzDeg/2 and |Δel| ≤ fovElDeg/2.
 *  - sector: azimuth offset 0 within |Δaz| ≤ sectorWidthDeg/2, beyond the edge the pattern at the excess
 *    angle (its roll-off); instrumented within the elevation FOV.
 *  - rotating: azimuth offset 0 everywhere (peak azimuth gain); instrumented within the elevation FOV.
 * The elevation FOV bounds every mode (the cone above a fan beam is not processed). A target below the
 * horizon (negative elevation) is treated like any other elevation: only the FOV and tilt decide.
 * @param pointing scan mode (FOV and sector widths, degrees > 0), boresight azimuth (degrees clockwise
 *   from north, any real) and tilt (degrees, positive up).
 * @param targetAzDeg azimuth of the target, degrees clockwise from north (any real; wrapped).
 * @param targetElDeg elevation of the target seen from the antenna, degrees, positive up, [−90, 90].
 * @returns the geometry; NaN offsets and false flags for NaN inputs; a NaN elevation FOV gives false
 *   flags (widths ≤ 0 are rejected at the edge, src/io).
 * Reference: geometry of angle offsets (common practice); the sector rule (peak azimuth gain inside the
 * scanned sector, the beam's roll-off beyond its edge) is the envelope of a beam scanned over the sector
 * (Skolnik, Introduction to Radar Systems, 3rd ed., 2001, ch. 9, scanning antennas; from memory, section
 * not checked).
 */
export function scanGeometry(
  pointing: Omit<AntennaPointing, "antenna">,
  targetAzDeg: number,
  targetElDeg: number,
): ScanGeometry {
  const azOffDeg = wrapDeg180(targetAzDeg - pointing.boresightAzDeg);
  const elOffDeg = targetElDeg - pointing.tiltDeg;
  const scan = pointing.scan;
  const inElFov = Math.abs(elOffDeg) <= scan.fovElDeg / 2;
  const absAz = Math.abs(azOffDeg);
  if (scan.kind === "staring") {
    const inSector = inElFov && absAz <= scan.fovAzDeg / 2;
    return { azOffDeg, elOffDeg, patternAzOffDeg: azOffDeg, inSector, instrumented: inSector };
  }
  if (scan.kind === "sector") {
    const half = scan.sectorWidthDeg / 2;
    const excess = absAz > half ? absAz - half : Number.isNaN(absAz) ? Number.NaN : 0;
    const patternAzOffDeg = azOffDeg < 0 ? -excess : excess;
    return { azOffDeg, elOffDeg, patternAzOffDeg, inSector: inElFov && absAz <= half, instrumented: inElFov };
  }
  const patternAzOffDeg = Number.isNaN(azOffDeg) ? Number.NaN : 0;
  return { azOffDeg, elOffDeg, patternAzOffDeg, inSector: inElFov, instrumented: inElFov };
}

/** Gain of a mounted antenna towards a target direction. */
export interface TargetGain {
  /** Gain towards the target, dBi; −Infinity where the radar does not detect (not instrumented). */
  gainDbi: number;
  /** Gain relative to peak, dB; −Infinity where not instrumented. */
  relativeGainDb: number;
  /** Inside the nominal coverage sector (see ScanGeometry.inSector). */
  inSector: boolean;
  /** The radar processes returns from this direction (see ScanGeometry.instrumented). */
  instrumented: boolean;
}

/**
 * Gain of a mounted, scanning antenna towards a target azimuth and elevation, dBi:
 * G = G0 + relativeGainDb(antenna, Δaz_pattern, Δel) inside the instrumented field (scanGeometry for the
 * scan rules, relativeGainDb for the pattern).
 * @param pointing antenna (see gainDbi for units and ranges), scan mode, boresight azimuth (degrees
 *   clockwise from north) and tilt (degrees, positive up).
 * @param targetAzDeg degrees clockwise from true north (any real; wrapped); targetElDeg degrees, positive
 *   up, [−90, 90] (below the horizon is allowed: the FOV and tilt decide).
 * @returns gain and flags; gainDbi −Infinity outside the instrumented field; NaN gain for NaN inputs.
 * Reference: as scanGeometry and relativeGainDb (Gaussian beam: common practice; sinc² beam: Balanis,
 * Antenna Theory, 4th ed., §12.5.1, from memory; separable pattern: Barton 2005, ch. 3, from memory).
 */
export function towardsTarget(
  pointing: AntennaPointing,
  targetAzDeg: number,
  targetElDeg: number,
): TargetGain {
  const geo = scanGeometry(pointing, targetAzDeg, targetElDeg);
  let rel = relativeGainDb(pointing.antenna, geo.patternAzOffDeg, geo.elOffDeg);
  if (!Number.isNaN(rel) && !geo.instrumented) rel = Number.NEGATIVE_INFINITY;
  return {
    gainDbi: pointing.antenna.peakGainDbi + rel,
    relativeGainDb: rel,
    inSector: geo.inSector,
    instrumented: geo.instrumented,
  };
}

/**
 * The receive antenna of a radar: rxAntenna when given, else the transmit antenna (a monostatic radar
 * that shares one antenna for both ways; common practice). Not a physics formula: it selects which
 * pattern the receive gain g_r of the radar equation is read from.
 * @param radar txAntenna (required) and optional rxAntenna, as in RadarModel.
 * @returns radar.rxAntenna when it is defined, else radar.txAntenna (the same object, not a copy); no
 *   validation and no NaN handling here: the antenna's own fields are checked at the edge (src/io).
 * Reference: monostatic radar equation with G_t = G_r = G for a shared antenna (Skolnik, Introduction to
 * Radar Systems, 3rd ed., 2001, §1.2, from memory, equation number not checked).
 */
export function receiveAntenna(radar: { txAntenna: AntennaSpec; rxAntenna?: AntennaSpec }): AntennaSpec {
  return radar.rxAntenna ?? radar.txAntenna;
}

/** Linear factor of one axis as a closure: analytic shape or measured cut, no floor. */
function axisFactor(antenna: AntennaSpec, axis: "az" | "el"): (offDeg: number) => number {
  const cut = axis === "az" ? antenna.azCut : antenna.elCut;
  if (cut !== undefined) return (offDeg) => dbToLinear(cutRelativeDb(cut, offDeg));
  const beamwidthDeg = axis === "az" ? antenna.azBeamwidthDeg : antenna.elBeamwidthDeg;
  if (!(beamwidthDeg > 0)) return () => Number.NaN;
  if (antenna.mainBeam === "gaussian") {
    const a = GAUSSIAN_LN_EXPONENT / (beamwidthDeg * beamwidthDeg);
    return (offDeg) => Math.exp(-a * offDeg * offDeg);
  }
  const k = (2 * SINC2_HALF_POWER_ARGUMENT) / beamwidthDeg;
  return (offDeg) => {
    const u = k * Math.abs(offDeg);
    if (u >= Math.PI) return 0;
    if (u === 0) return 1;
    const s = Math.sin(u) / u;
    return s * s;
  };
}

/** Linear one-way relative gain as a closure over a target direction (deg, deg) → ratio in [floor, 1]. */
function oneWayRelativeGain(pointing: AntennaPointing): (targetAzDeg: number, targetElDeg: number) => number {
  const { antenna, scan, boresightAzDeg, tiltDeg } = pointing;
  const floorLin = dbToLinear(antenna.sidelobeFloorDb);
  const fAz = axisFactor(antenna, "az");
  const fEl = axisFactor(antenna, "el");
  const halfEl = scan.fovElDeg / 2;
  const halfAz =
    scan.kind === "staring" ? scan.fovAzDeg / 2 : scan.kind === "sector" ? scan.sectorWidthDeg / 2 : 0;
  const az0 = fAz(0);
  return (targetAzDeg, targetElDeg) => {
    const el = targetElDeg - tiltDeg;
    if (!(Math.abs(el) <= halfEl)) return Number.isNaN(el) ? Number.NaN : 0;
    const az = wrapDeg180(targetAzDeg - boresightAzDeg);
    let gAz: number;
    if (scan.kind === "rotating") gAz = Number.isNaN(az) ? Number.NaN : az0;
    else if (scan.kind === "staring") {
      if (!(Math.abs(az) <= halfAz)) return Number.isNaN(az) ? Number.NaN : 0;
      gAz = fAz(az);
    } else {
      const absAz = Math.abs(az);
      gAz = absAz <= halfAz ? az0 : fAz(az < 0 ? halfAz - absAz : absAz - halfAz);
    }
    const g = gAz * fEl(el);
    return Math.max(g, floorLin);
  };
}

/**
 * Fast path for per-cell use: a closure giving the one-way linear gain relative to peak towards a target
 * direction, with every constant precomputed; equal to dbToLinear(towardsTarget(...).relativeGainDb).
 * Returns 0 where the radar does not detect (outside a staring FOV or the elevation FOV).
 * @param pointing antenna, scan, boresight azimuth and tilt (units and ranges as towardsTarget).
 * @returns (targetAzDeg, targetElDeg) → ratio in {0} ∪ [10^(floor/10), 1]; NaN for NaN inputs; NaN for
 *   every direction when a beamwidth is ≤ 0 and no cut replaces it.
 * Reference: as towardsTarget; the Gaussian factor exp(−4 ln2 θ²/θ3²) (common practice) and the sinc²
 * factor (sin u/u)² (Balanis, Antenna Theory, 4th ed., §12.5.1, from memory) in linear form.
 */
export function makeRelativeGain(
  pointing: AntennaPointing,
): (targetAzDeg: number, targetElDeg: number) => number {
  return oneWayRelativeGain(pointing);
}

/**
 * Fast path for per-cell use: a closure giving g_t · g_r, the product of the transmit and receive linear
 * gains relative to their peaks towards a target direction (receive falls back to transmit). Multiply by
 * snrConstant (which holds the peak gains), F⁴ and 1/R⁴ to get the SNR (radarEquation.ts).
 * @param radar transmit antenna, optional receive antenna, scan, boresight azimuth (degrees clockwise
 *   from north) and tilt (degrees, positive up); both antennas share the pointing.
 * @returns (targetAzDeg, targetElDeg) → ratio in {0} ∪ [floor_t·floor_r, 1]; NaN for NaN inputs.
 * Reference: the G_t·G_r product of the monostatic radar equation (Skolnik, Introduction to Radar
 * Systems, 3rd ed., 2001, §1.2 and ch. 2, from memory, equation numbers not checked), each gain the peak
 * gain times the one-way relative pattern of makeRelativeGain; for a shared antenna the two-way pattern
 * is the one-way pattern squared (common practice).
 */
export function makeTwoWayRelativeGain(radar: {
  txAntenna: AntennaSpec;
  rxAntenna?: AntennaSpec;
  scan: ScanMode;
  boresightAzDeg: number;
  tiltDeg: number;
}): (targetAzDeg: number, targetElDeg: number) => number {
  const base = { scan: radar.scan, boresightAzDeg: radar.boresightAzDeg, tiltDeg: radar.tiltDeg };
  const tx = oneWayRelativeGain({ ...base, antenna: radar.txAntenna });
  if (radar.rxAntenna === undefined) {
    return (az, el) => {
      const g = tx(az, el);
      return g * g;
    };
  }
  const rx = oneWayRelativeGain({ ...base, antenna: radar.rxAntenna });
  return (az, el) => tx(az, el) * rx(az, el);
}
