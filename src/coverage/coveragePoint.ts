/**
 * The exact scalar path of the coverage stage (one point): for the point inspector (evaluatePoint) and
 * as the yardstick of the stage's tables (rule CV2). Same physics as coverage.ts's hot loop, with the
 * trigonometry, the knife-edge loss J(v) (ITU-R P.526-15 eq. 31), the gas loss (ITU-R P.676) and Pd
 * (detection.ts pdExact) evaluated directly.
 */
import { makeRelativeGain, receiveAntenna, scanGeometry } from "./antennaPattern.ts";
import { twoWayGasLossDb } from "./atmosphere.ts";
import {
  type DetectionRequirement,
  type PlacedRadar,
  Reason,
  radarRangeWindowM,
  type TargetSpec,
} from "./coverage.ts";
import { pdExact } from "./detection.ts";
import { cachedPdDbTable, pdFromSnrDb } from "./pdDbTable.ts";
import { knifeEdgeLossDb } from "./propagation.ts";
import { type RadarEquationParams, radarEquationParams, snrAtRange } from "./radarEquation.ts";
import { curvatureFactorPerM } from "./terrainMask.ts";
import { dbsmToM2, linearToDb, radToDeg, wrapDeg360 } from "./units.ts";
import { wavelengthM } from "./waveform.ts";

/** Geometry of one target position seen from a radar. */
export interface PointGeometry {
  /** Horizontal distance, m. */
  distanceM: number;
  /** Target height above the antenna after Earth curvature, m. */
  heightAboveAntennaM: number;
  /** Slant range, m. */
  slantRangeM: number;
  /** Bearing from the radar, degrees clockwise from north. */
  azimuthDeg: number;
  /** Elevation seen from the antenna, degrees (curvature included). */
  elevationDeg: number;
}

/** Exact (no table) coverage of one radar at one target position and class. */
export interface PointCoverage {
  geometry: PointGeometry;
  /** Radar-equation parameters towards the target (gains, gas loss, F⁴), for the link budget. */
  params: RadarEquationParams;
  /** One-way gains towards the target, dBi (−Infinity where not instrumented). */
  txGainDbi: number;
  rxGainDbi: number;
  /** Height of the dominant obstruction above the sight line, m (−Infinity: nothing obstructs). */
  obstructionClearanceM: number;
  /** Fresnel–Kirchhoff v of that obstruction (−Infinity when none). */
  fresnelV: number;
  /** One-way knife-edge loss J(v), dB (ITU-R P.526-15 eq. 31). */
  diffractionLossOneWayDb: number;
  /** Two-way gas loss, dB. */
  gasLossDb: number;
  /** SNR for the class's RCS, dB. */
  snrDb: number;
  /** Exact Pd (detection.ts pdExact) and the table Pd. */
  pdExact: number;
  pdTable: number;
  visible: boolean;
  reason: Reason;
}

/**
 * Exact coverage of one radar at one cell and height for one class: same physics as the hot loop with
 * trigonometry, J(v) and pdExact evaluated directly (the yardstick of the tables, rule CV2).
 * @param cell the cell's horizon slope (m/m, −Infinity none, NaN nodata), obstacle distance (m),
 *   horizontal distance (m), east/north offsets from the radar (m), ground (m ASL), obstruction top (m AGL)
 *   and the cell size (m; the shortest edge-to-target distance). Out-of-field cells get Pd 0.
 */
export function coveragePoint(
  input: {
    radar: PlacedRadar;
    target: TargetSpec;
    requirement: DetectionRequirement;
    effectiveEarthFactor: number;
    heightAglM: number;
  },
  cell: {
    horizonSlope: number;
    obstacleDistanceM: number;
    distanceM: number;
    eastM: number;
    northM: number;
    groundM: number;
    obstructionTopAglM: number;
    cellSizeM: number;
  },
): PointCoverage {
  const { radar, target, requirement, heightAglM } = input;
  const model = radar.model;
  const curv = curvatureFactorPerM(input.effectiveEarthFactor);
  const d = cell.distanceM;
  const dh = cell.groundM + heightAglM - radar.antennaHeightAslM - d * d * curv;
  const R = Math.hypot(d, dh);
  const azimuthDeg = d > 0 ? wrapDeg360(radToDeg(Math.atan2(cell.eastM, cell.northM))) : radar.boresightAzDeg;
  const elevationDeg = radToDeg(Math.atan2(dh, d));
  const geometry: PointGeometry = {
    distanceM: d,
    heightAboveAntennaM: dh,
    slantRangeM: R,
    azimuthDeg,
    elevationDeg,
  };
  const pointing = { scan: radar.scan, boresightAzDeg: radar.boresightAzDeg, tiltDeg: radar.tiltDeg };
  const gTx = makeRelativeGain({ ...pointing, antenna: model.txAntenna })(azimuthDeg, elevationDeg);
  const gRx = makeRelativeGain({ ...pointing, antenna: receiveAntenna(model) })(azimuthDeg, elevationDeg);
  const txGainDbi = model.txAntenna.peakGainDbi + linearToDb(gTx);
  const rxGainDbi = receiveAntenna(model).peakGainDbi + linearToDb(gRx);
  const geo = scanGeometry(pointing, azimuthDeg, elevationDeg);
  let clearance = Number.NEGATIVE_INFINITY;
  let v = Number.NEGATIVE_INFINITY;
  if (cell.horizonSlope !== Number.NEGATIVE_INFINITY && Number.isFinite(cell.horizonSlope)) {
    const s = cell.obstacleDistanceM;
    clearance = s * (cell.horizonSlope - dh / d);
    const rest = d - s > 0 ? d - s : 0.5 * cell.cellSizeM;
    v = clearance * Math.sqrt((2 / wavelengthM(model.frequencyHz)) * (1 / s + 1 / rest));
  }
  const jDb = v === Number.NEGATIVE_INFINITY ? 0 : knifeEdgeLossDb(v);
  const { minM, maxM } = radarRangeWindowM(model);
  const gasLossRaw = twoWayGasLossDb({ frequencyHz: model.frequencyHz, rangeM: R });
  // Below 1 GHz P.676 is not evaluated (NaN) and the loss is negligible: 0, as in buildRadarKernel.
  const gasLossDb = Number.isFinite(gasLossRaw) ? gasLossRaw : 0;
  const params = radarEquationParams(model, {
    rcsM2: dbsmToM2(target.rcsDbsm),
    txGainDbi,
    rxGainDbi,
    atmosphericLossDb: gasLossDb,
    propagationFactorDb: -2 * jDb,
  });
  const snrLinear = snrAtRange(params, R);
  const snrDb = linearToDb(snrLinear);
  const visible = !(clearance > 0);
  let reason: Reason;
  if (Number.isNaN(cell.groundM) || Number.isNaN(cell.horizonSlope)) reason = Reason.nodata;
  else if (cell.obstructionTopAglM > heightAglM) reason = Reason.insideObstruction;
  else if (R < minM || R === 0) reason = Reason.blindZone;
  else if (R > maxM) reason = Reason.outOfRange;
  else if (!geo.instrumented) reason = Reason.outOfSector;
  else reason = Reason.tooWeak;
  let pdE = 0;
  let pdT = 0;
  if (reason === Reason.tooWeak) {
    pdE = pdExact({ snrLinear, pfa: requirement.pfa, looks: requirement.looks, swerling: target.swerling });
    pdT = pdFromSnrDb(cachedPdDbTable(requirement.pfa, requirement.looks, target.swerling), snrDb);
    if (pdT >= requirement.requiredPd) reason = Reason.covered;
    else if (!geo.inSector) reason = Reason.outOfSector;
    else if (!visible) reason = Reason.masked;
  }
  return {
    geometry,
    params,
    txGainDbi,
    rxGainDbi,
    obstructionClearanceM: clearance,
    fresnelV: v,
    diffractionLossOneWayDb: jDb,
    gasLossDb,
    snrDb,
    pdExact: pdE,
    pdTable: pdT,
    visible,
    reason,
  };
}
