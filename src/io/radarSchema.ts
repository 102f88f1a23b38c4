/**
 * The radar model file: the zod schema of one radar type (the radar-model part of the plan format).
 * It produces exactly `RadarModel` of src/coverage/radarModel.ts (checked at compile time below).
 * Every number carries its unit in its name and a stated range; errors name the path, e.g.
 * `transmitter.peakPowerW: must be > 0 W (got -3)`. Fields are documented in docs/plan-format.md.
 */
import { z } from "zod";
import type { RadarModel } from "../coverage/radarModel.ts";
import {
  displayName,
  type FieldError,
  identifier,
  issuesToErrors,
  oneOf,
  quantity,
  record,
} from "./schemaFields.ts";

// Ranges are plausibility bounds that catch unit slips (kW for W, GHz for Hz, ms for s), not limits of the model.
/** Lowest carrier accepted, Hz (HF radars start at 3 MHz; ground surveillance radars are far above). */
const MIN_FREQUENCY_HZ = 3e6;
/** Highest carrier accepted, Hz (upper end of the millimetre-wave band, 300 GHz). */
const MAX_FREQUENCY_HZ = 3e11;

/** Cross-field rules run even when a field failed its own check; they only compare real numbers. */
function bothFinite(a: unknown, b: unknown): boolean {
  return typeof a === "number" && typeof b === "number" && Number.isFinite(a) && Number.isFinite(b);
}

const patternCutSchema = record(
  {
    angleDeg: z
      .array(quantity({ unit: "deg", min: -180, max: 180, description: "Angle off boresight, degrees" }))
      .min(2, { error: "needs at least 2 points" })
      .meta({ description: "Angles off boresight, degrees, strictly ascending within [-180, 180]" }),
    relativeGainDb: z
      .array(quantity({ unit: "dB", max: 0, min: -100, description: "Gain relative to peak, dB (≤ 0)" }))
      .meta({ description: "Gain relative to the peak at each angle, dB (≤ 0)" }),
  },
  "A measured pattern cut: angle off boresight (deg) and gain relative to peak (dB)",
).superRefine((cut, ctx) => {
  if (!Array.isArray(cut.angleDeg) || !Array.isArray(cut.relativeGainDb)) return;
  if (cut.relativeGainDb.length !== cut.angleDeg.length) {
    ctx.addIssue({
      code: "custom",
      path: ["relativeGainDb"],
      message: `has ${cut.relativeGainDb.length} values but angleDeg has ${cut.angleDeg.length}`,
    });
  }
  for (let i = 1; i < cut.angleDeg.length; i++) {
    if (bothFinite(cut.angleDeg[i], cut.angleDeg[i - 1]) && !(cut.angleDeg[i] > cut.angleDeg[i - 1])) {
      ctx.addIssue({
        code: "custom",
        path: ["angleDeg", i],
        message: `${cut.angleDeg[i]} deg does not follow ${cut.angleDeg[i - 1]} deg (angles must be strictly ascending)`,
      });
      break;
    }
  }
});

export const antennaSchema = record(
  {
    peakGainDbi: quantity({ unit: "dBi", min: -10, max: 60, description: "Peak gain, dBi" }),
    azBeamwidthDeg: quantity({
      unit: "deg",
      gt: 0,
      max: 360,
      description: "Half-power (−3 dB) beamwidth in azimuth, degrees (0, 360]",
    }),
    elBeamwidthDeg: quantity({
      unit: "deg",
      gt: 0,
      max: 180,
      description: "Half-power (−3 dB) beamwidth in elevation, degrees (0, 180]",
    }),
    sidelobeFloorDb: quantity({
      unit: "dB",
      min: -80,
      max: 0,
      description: "Sidelobe floor relative to peak, dB (≤ 0); the pattern never falls below it",
    }),
    mainBeam: oneOf(["gaussian", "sinc2"], "Main-beam shape used when no measured cut is given").default(
      "gaussian",
    ),
    azCut: patternCutSchema.optional(),
    elCut: patternCutSchema.optional(),
  },
  "An antenna: peak gain, beamwidths, sidelobe floor, optional measured cuts",
);

const pulsedSchema = record(
  {
    kind: z.literal("pulsed"),
    pulseWidthS: quantity({ unit: "s", gt: 0, max: 0.01, description: "Transmitted pulse length, s" }),
    prfHz: quantity({ unit: "Hz", gt: 0, max: 1e6, description: "Pulse repetition frequency, Hz" }),
    pulsesIntegrated: quantity({
      unit: "",
      integer: true,
      min: 1,
      max: 1e6,
      description: "Pulses integrated coherently in one look, ≥ 1",
    }),
    bandwidthHz: quantity({
      unit: "Hz",
      gt: 0,
      max: 1e10,
      description: "Swept bandwidth of a compressed pulse, Hz (default 1/pulseWidthS)",
    }).optional(),
  },
  "Pulsed waveform",
).superRefine((w, ctx) => {
  if (!bothFinite(w.pulseWidthS, w.prfHz)) return;
  const duty = w.pulseWidthS * w.prfHz;
  if (duty > 1) {
    ctx.addIssue({
      code: "custom",
      path: ["pulseWidthS"],
      message: `${w.pulseWidthS} s at ${w.prfHz} Hz is a duty cycle of ${duty.toPrecision(3)} (must be ≤ 1)`,
    });
  }
});

const fmcwSchema = record(
  {
    kind: z.literal("fmcw"),
    chirpBandwidthHz: quantity({
      unit: "Hz",
      gt: 0,
      max: 1e10,
      description: "Swept bandwidth of one chirp, Hz",
    }),
    chirpDurationS: quantity({
      unit: "s",
      gt: 0,
      max: 1,
      description: "Duration of the frequency ramp of one chirp, s",
    }),
    chirpPeriodS: quantity({
      unit: "s",
      gt: 0,
      max: 1,
      description: "Chirp repetition period (ramp plus reset), s, ≥ chirpDurationS",
    }),
    chirpsPerFrame: quantity({
      unit: "",
      integer: true,
      min: 1,
      max: 65536,
      description: "Chirps integrated coherently in one look (one frame), ≥ 1",
    }),
    ifSampleRateHz: quantity({
      unit: "Hz",
      gt: 0,
      max: 1e10,
      description: "ADC sample rate of the IF signal, Hz",
    }),
    ifSampling: oneOf(
      ["real", "complex"],
      "Real sampling resolves beat frequencies to fs/2, complex (I/Q) to fs",
    ),
  },
  "FMCW waveform (linear chirps)",
).superRefine((w, ctx) => {
  if (bothFinite(w.chirpPeriodS, w.chirpDurationS) && w.chirpPeriodS < w.chirpDurationS) {
    ctx.addIssue({
      code: "custom",
      path: ["chirpPeriodS"],
      message: `${w.chirpPeriodS} s is shorter than chirpDurationS (${w.chirpDurationS} s)`,
    });
  }
});

const waveformSchema = z
  .discriminatedUnion("kind", [pulsedSchema, fmcwSchema], {
    error: (iss) =>
      iss.code === "invalid_union" ? `kind must be "pulsed" or "fmcw"` : "is required (a waveform object)",
  })
  .meta({ description: "The waveform: pulsed or FMCW" });

const fovElDeg = quantity({
  unit: "deg",
  gt: 0,
  max: 180,
  description: "Instrumented elevation field of view, degrees, centred on the tilt",
});

const scanSchema = z
  .discriminatedUnion(
    "kind",
    [
      record(
        {
          kind: z.literal("staring"),
          fovAzDeg: quantity({
            unit: "deg",
            gt: 0,
            max: 360,
            description: "Instrumented azimuth field of view, degrees, centred on boresight",
          }),
          fovElDeg,
        },
        "Fixed antenna; the pattern limits coverage around boresight",
      ),
      record(
        {
          kind: z.literal("sector"),
          sectorWidthDeg: quantity({
            unit: "deg",
            gt: 0,
            max: 360,
            description: "Width of the scanned sector, degrees, centred on boresight",
          }),
          fovElDeg,
        },
        "Scanned over a sector centred on boresight; peak azimuth gain inside it",
      ),
      record(
        { kind: z.literal("rotating"), fovElDeg },
        "Rotating through 360°; peak azimuth gain on every bearing",
      ),
    ],
    {
      error: (iss) =>
        iss.code === "invalid_union"
          ? `kind must be "staring", "sector" or "rotating"`
          : "is required (a scan object)",
    },
  )
  .meta({ description: "How the radar covers azimuth" });

/** The zod schema of one radar model (file or inline in a plan). */
export const radarModelSchema = record(
  {
    id: identifier("Stable identifier that posts use to refer to this model"),
    name: displayName("Display name"),
    invented: z.boolean().optional().meta({ description: "True for an invented example model" }),
    frequencyHz: quantity({
      unit: "Hz",
      min: MIN_FREQUENCY_HZ,
      max: MAX_FREQUENCY_HZ,
      description: "Carrier (centre) frequency, Hz",
    }),
    transmitter: record(
      {
        peakPowerW: quantity({
          unit: "W",
          gt: 0,
          max: 1e7,
          description: "Peak transmitted power at the antenna port, W",
        }),
      },
      "Transmitter",
    ),
    receiver: record(
      {
        noiseFigureDb: quantity({ unit: "dB", min: 0, max: 30, description: "Receiver noise figure, dB" }),
        systemLossDb: quantity({
          unit: "dB",
          min: 0,
          max: 60,
          description: "Two-way system losses (RF, processing, beam shape), dB ≥ 0",
        }),
      },
      "Receiver",
    ),
    waveform: waveformSchema,
    txAntenna: antennaSchema,
    rxAntenna: antennaSchema.optional(),
    scan: scanSchema,
    updateIntervalS: quantity({
      unit: "s",
      gt: 0,
      max: 3600,
      description: "Time between looks at the same cell (revisit or frame period), s",
    }),
    looksIntegrated: quantity({
      unit: "",
      integer: true,
      min: 1,
      max: 1000,
      description: "Looks integrated non-coherently before a detection decision (absent: 1)",
    }).optional(),
    blindZoneM: quantity({ unit: "m", min: 0, max: 1e5, description: "Nearest range of detection, m" }),
    maxInstrumentedRangeM: quantity({
      unit: "m",
      gt: 0,
      max: 5e5,
      description: "Maximum instrumented range set by the processing, m",
    }),
    clutterImprovementDb: quantity({
      unit: "dB",
      min: 0,
      max: 100,
      description: "MTI / Doppler clutter improvement factor, dB (optional clutter model)",
    }).optional(),
  },
  "A radar model: one radar type with its transmitter, receiver, waveform, antennas and scan",
).superRefine((m, ctx) => {
  if (bothFinite(m.maxInstrumentedRangeM, m.blindZoneM) && m.maxInstrumentedRangeM <= m.blindZoneM) {
    ctx.addIssue({
      code: "custom",
      path: ["maxInstrumentedRangeM"],
      message: `${m.maxInstrumentedRangeM} m is not beyond the blind zone, blindZoneM (${m.blindZoneM} m)`,
    });
  }
});

// Compile-time proof that the schema produces exactly RadarModel, in both directions.
type RadarModelOutput = z.output<typeof radarModelSchema>;
type Exactly<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const radarModelTypeMatches: Exactly<RadarModelOutput, RadarModel> = true;
void radarModelTypeMatches;

export type ParseRadarModelResult = { ok: true; model: RadarModel } | { ok: false; errors: FieldError[] };

/** Validate an already-parsed JSON value as a radar model. Never throws; never mutates `json`. */
export function parseRadarModel(json: unknown): ParseRadarModelResult {
  try {
    const r = radarModelSchema.safeParse(json);
    if (r.success) return { ok: true, model: r.data };
    return { ok: false, errors: issuesToErrors(r.error.issues) };
  } catch (err) {
    return {
      ok: false,
      errors: [{ path: "(file)", message: `cannot be read as a radar model (${String(err)})` }],
    };
  }
}
