/**
 * The starting figures of a radar model the user adds from scratch ("New model" in the library): a
 * generic rotating X-band pulsed surveillance radar of round, plausible figures (a −20 dBsm target at
 * Pd 0.9, Pfa 1e-6 in free space at about 1.5 km; instrumented to 3 km), to be edited into the
 * user's own. Not an example product: it carries no `invented` flag, and its name says what it is.
 */
import type { RadarModel } from "../coverage/radarModel";
import { MAX_NAME_CHARS } from "../io/schemaFields";
import { freshId } from "./store";

export const NEW_RADAR_MODEL_NAME = "New radar model";

export function newRadarModel(existing: ReadonlyArray<{ id: string }>): RadarModel {
  return {
    id: freshId("radar-model", existing),
    name: NEW_RADAR_MODEL_NAME,
    frequencyHz: 9.5e9,
    transmitter: { peakPowerW: 400 },
    receiver: { noiseFigureDb: 4, systemLossDb: 6 },
    waveform: { kind: "pulsed", pulseWidthS: 1e-6, prfHz: 5000, pulsesIntegrated: 32, bandwidthHz: 1e6 },
    txAntenna: {
      peakGainDbi: 28,
      azBeamwidthDeg: 3,
      elBeamwidthDeg: 12,
      sidelobeFloorDb: -25,
      mainBeam: "sinc2",
    },
    scan: { kind: "rotating", fovElDeg: 12 },
    updateIntervalS: 1,
    looksIntegrated: 1,
    blindZoneM: 150,
    maxInstrumentedRangeM: 3000,
  };
}

/** Put after the name of an imported model whose id and name are both taken. */
const IMPORTED_SUFFIX = " (imported)";

/**
 * A model read from a file as the library takes it: as it is, or, when its id is taken, under a new
 * id, and then with " (imported)" after a name already in the library, so that the list and the
 * posts' model choice never show two entries alike.
 */
export function importedRadarModel(existing: ReadonlyArray<RadarModel>, model: RadarModel): RadarModel {
  if (!existing.some((m) => m.id === model.id)) return model;
  const id = freshId(model.id, existing);
  const taken = existing.some((m) => m.name === model.name);
  const name = taken
    ? `${model.name.slice(0, MAX_NAME_CHARS - IMPORTED_SUFFIX.length)}${IMPORTED_SUFFIX}`
    : model.name;
  return { ...model, id, name };
}
