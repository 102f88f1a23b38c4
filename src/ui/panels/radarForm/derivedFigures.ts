/**
 * Derived figures of a radar model shown beside the form, each from a src/coverage function (no
 * physics here): range resolution, blind zone, unambiguous or IF-limited maximum range, duty cycle,
 * average power, and the free-space detection range of a small reference target at the plan's Pd/Pfa.
 */
import { requiredSnrDb } from "../../../coverage/detection";
import { radarEquationParams, rangeForSnr } from "../../../coverage/radarEquation";
import type { RadarModel } from "../../../coverage/radarModel";
import {
  averagePowerW,
  blindZoneM,
  dutyCycle,
  fmcwMaxRangeM,
  rangeResolutionM,
  unambiguousRangeM,
} from "../../../coverage/waveform";
import type { Requirement } from "../../../io/planSchema";

/** RCS of the reference target of the free-space range figure, m² (a small drone-sized target). */
export const REFERENCE_RCS_M2 = 0.01;
/** Swerling case of the reference target (scan-to-scan fluctuation). */
export const REFERENCE_SWERLING = 1;

export interface DerivedFigures {
  rangeResolutionM: number;
  blindZoneM: number;
  /** Pulsed: c/(2·PRF); NaN for FMCW. */
  unambiguousRangeM: number;
  /** FMCW: range limit from the IF sampling; NaN for pulsed. */
  fmcwMaxRangeM: number;
  dutyCycle: number;
  averagePowerW: number;
  /** SNR the reference target needs per look at the requirement's Pd, Pfa and looks, dB. */
  requiredSnrDb: number;
  /** Free-space range of the reference target at the required SNR, peak gains, m. */
  freeSpaceRangeM: number;
}

export function derivedFigures(m: RadarModel, req: Requirement): DerivedFigures {
  const snrDb = requiredSnrDb({
    pd: req.requiredPd,
    pfa: req.pfa,
    looks: req.looks,
    swerling: REFERENCE_SWERLING,
  });
  return {
    rangeResolutionM: rangeResolutionM(m.waveform),
    blindZoneM: blindZoneM(m.waveform, m.blindZoneM),
    unambiguousRangeM: unambiguousRangeM(m.waveform),
    fmcwMaxRangeM: m.waveform.kind === "fmcw" ? fmcwMaxRangeM(m.waveform) : Number.NaN,
    dutyCycle: dutyCycle(m.waveform),
    averagePowerW: averagePowerW(m.transmitter.peakPowerW, m.waveform),
    requiredSnrDb: snrDb,
    freeSpaceRangeM: rangeForSnr(radarEquationParams(m, { rcsM2: REFERENCE_RCS_M2 }), snrDb),
  };
}
