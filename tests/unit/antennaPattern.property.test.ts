/** Property checks of the antenna patterns and scan modes (fast-check). */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { makeRelativeGain, relativeGainDb, towardsTarget } from "../../src/coverage/antennaPattern.ts";
import type { AntennaSpec, ScanMode } from "../../src/coverage/radarModel.ts";
import { dbToLinear } from "../../src/coverage/units.ts";

const analyticAntenna: fc.Arbitrary<AntennaSpec> = fc.record({
  peakGainDbi: fc.double({ min: 0, max: 45, noNaN: true }),
  azBeamwidthDeg: fc.double({ min: 0.5, max: 360, noNaN: true }),
  elBeamwidthDeg: fc.double({ min: 0.5, max: 180, noNaN: true }),
  sidelobeFloorDb: fc.double({ min: -60, max: -5, noNaN: true }),
  mainBeam: fc.constantFrom("gaussian" as const, "sinc2" as const),
});
const azDeg = fc.double({ min: -180, max: 180, noNaN: true });
const elDeg = fc.double({ min: -90, max: 90, noNaN: true });
const scanMode: fc.Arbitrary<ScanMode> = fc.oneof(
  fc.record({
    kind: fc.constant("staring" as const),
    fovAzDeg: fc.double({ min: 10, max: 360, noNaN: true }),
    fovElDeg: fc.double({ min: 10, max: 180, noNaN: true }),
  }),
  fc.record({
    kind: fc.constant("sector" as const),
    sectorWidthDeg: fc.double({ min: 0, max: 360, noNaN: true }),
    fovElDeg: fc.double({ min: 10, max: 180, noNaN: true }),
  }),
  fc.record({
    kind: fc.constant("rotating" as const),
    fovElDeg: fc.double({ min: 10, max: 180, noNaN: true }),
  }),
);
/** A measured cut with arbitrary shape (not monotone), angles ascending. */
const measuredCut = fc
  .array(
    fc.tuple(fc.double({ min: -180, max: 180, noNaN: true }), fc.double({ min: -50, max: 0, noNaN: true })),
    {
      minLength: 2,
      maxLength: 12,
    },
  )
  .map((pts) => {
    const sorted = [...new Map(pts.map(([a, g]) => [a, g])).entries()].sort((x, y) => x[0] - y[0]);
    return { angleDeg: sorted.map((p) => p[0]), relativeGainDb: sorted.map((p) => p[1]) };
  });

describe("antenna pattern properties", () => {
  it("[AP2] gain never rises moving off boresight, in azimuth or in elevation (analytic beams)", () => {
    fc.assert(
      fc.property(analyticAntenna, azDeg, azDeg, elDeg, elDeg, (ant, a1, a2, e1, e2) => {
        const [an, af] = Math.abs(a1) <= Math.abs(a2) ? [a1, a2] : [a2, a1];
        const [en, ef] = Math.abs(e1) <= Math.abs(e2) ? [e1, e2] : [e2, e1];
        expect(relativeGainDb(ant, an, en)).toBeGreaterThanOrEqual(relativeGainDb(ant, af, en));
        expect(relativeGainDb(ant, an, en)).toBeGreaterThanOrEqual(relativeGainDb(ant, an, ef));
      }),
    );
  });

  it("[AP3] floor ≤ relative gain ≤ 0 dB, analytic beams and measured cuts", () => {
    fc.assert(
      fc.property(analyticAntenna, measuredCut, azDeg, elDeg, (ant, cut, a, e) => {
        for (const spec of [ant, { ...ant, azCut: cut }, { ...ant, elCut: cut }]) {
          const g = relativeGainDb(spec, a, e);
          expect(g).toBeGreaterThanOrEqual(spec.sidelobeFloorDb);
          expect(g).toBeLessThanOrEqual(0);
        }
      }),
    );
  });

  it("[AP4] analytic patterns are symmetric in azimuth and elevation and periodic in azimuth", () => {
    fc.assert(
      fc.property(analyticAntenna, azDeg, elDeg, (ant, a, e) => {
        const g = relativeGainDb(ant, a, e);
        expect(relativeGainDb(ant, -a, e)).toBe(g);
        expect(relativeGainDb(ant, a, -e)).toBe(g);
        // Adding a turn changes the wrapped offset by rounding only: 1e-9 dB.
        expect(Math.abs(relativeGainDb(ant, a + 360, e) - g)).toBeLessThan(1e-9);
      }),
    );
  });

  it("[AP7] the fast path equals the slow path for every scan mode, pattern and direction", () => {
    fc.assert(
      fc.property(
        analyticAntenna,
        fc.option(measuredCut, { nil: undefined }),
        scanMode,
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.double({ min: -20, max: 20, noNaN: true }),
        fc.double({ min: -720, max: 720, noNaN: true }),
        elDeg,
        (ant, cut, scan, boresightAzDeg, tiltDeg, a, e) => {
          const pointing = { antenna: { ...ant, azCut: cut }, scan, boresightAzDeg, tiltDeg };
          const fast = makeRelativeGain(pointing)(a, e);
          const slow = towardsTarget(pointing, a, e);
          if (!slow.instrumented) expect(fast).toBe(0);
          // Linear vs dB paths (exp vs log10/pow): relative 1e-9.
          else expect(Math.abs(fast / dbToLinear(slow.relativeGainDb) - 1)).toBeLessThan(1e-9);
          expect(slow.gainDbi).toBe(pointing.antenna.peakGainDbi + slow.relativeGainDb);
        },
      ),
    );
  });

  it("[AP5] a rotating radar's gain does not depend on azimuth; a sector radar is at peak azimuth gain inside its sector", () => {
    fc.assert(
      fc.property(
        analyticAntenna,
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: -10, max: 10, noNaN: true }),
        (ant, bore, az, frac, e) => {
          const rot = towardsTarget(
            { antenna: ant, scan: { kind: "rotating", fovElDeg: 40 }, boresightAzDeg: bore, tiltDeg: 0 },
            az,
            e,
          );
          expect(rot.relativeGainDb).toBe(relativeGainDb(ant, 0, e));
          const sectorWidthDeg = 120;
          const inside = bore + (frac - 0.5) * sectorWidthDeg;
          const sec = towardsTarget(
            {
              antenna: ant,
              scan: { kind: "sector", sectorWidthDeg, fovElDeg: 40 },
              boresightAzDeg: bore,
              tiltDeg: 0,
            },
            inside,
            e,
          );
          expect(sec.relativeGainDb).toBe(relativeGainDb(ant, 0, e));
        },
      ),
    );
  });

  it("[AP5] NaN in, NaN out", () => {
    const ant: AntennaSpec = {
      peakGainDbi: 20,
      azBeamwidthDeg: 10,
      elBeamwidthDeg: 10,
      sidelobeFloorDb: -30,
      mainBeam: "sinc2",
    };
    const pointing = {
      antenna: ant,
      scan: { kind: "rotating", fovElDeg: 40 } as const,
      boresightAzDeg: 0,
      tiltDeg: 0,
    };
    expect(relativeGainDb(ant, Number.NaN, 0)).toBeNaN();
    expect(relativeGainDb(ant, 0, Number.NaN)).toBeNaN();
    expect(towardsTarget(pointing, Number.NaN, 0).gainDbi).toBeNaN();
    expect(makeRelativeGain(pointing)(Number.NaN, 0)).toBeNaN();
    expect(makeRelativeGain(pointing)(0, Number.NaN)).toBeNaN();
  });
});
