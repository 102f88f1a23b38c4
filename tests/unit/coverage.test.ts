import { describe, expect, it } from "vitest";
import { pseudoAngleBin, Reason, radarCoverageFromHorizon } from "../../src/coverage/coverage.ts";
import { coveragePoint } from "../../src/coverage/coveragePoint.ts";
import { computeRadarCoverage } from "../../src/coverage/evaluate.ts";
import { cachedPdDbTable, pdFromSnrDb } from "../../src/coverage/pdDbTable.ts";
import {
  cellXY,
  demoRadar,
  fixedWing,
  frameOf,
  placed,
  quad,
  roughGround,
  siteOf,
  stageOf,
} from "./coverageFixtures.ts";

describe("radar stage tables against the exact scalar path", () => {
  const cases = [
    { model: "mossbee-58" as const, cellM: 2, tilt: 3, bore: 60, mast: 18 },
    { model: "zorvane-s24" as const, cellM: 2, tilt: -4, bore: 200, mast: 25 },
    { model: "kalvori-x9" as const, cellM: 20, tilt: -1, bore: 0, mast: 30 },
  ];
  for (const c of cases) {
    it(`[CV2] ${c.model}: SNR within 0.1 dB and Pd within 0.01 of the exact path; reasons agree`, () => {
      const f = frameOf(300, 300, c.cellM);
      const ground = roughGround(f);
      const at = cellXY(f, 150, 150);
      const radar = placed(demoRadar(c.model), at, ground[150 * 300 + 150] + c.mast, {
        boresightAzDeg: c.bore,
        tiltDeg: c.tilt,
      });
      const site = siteOf(f, ground, [radar]);
      const { kernel, horizon } = stageOf(site, radar);
      const cov = radarCoverageFromHorizon(
        { ...site, frame: f, radar, effectiveEarthFactor: 4 / 3 },
        kernel,
        horizon,
      );
      let compared = 0;
      let reasonAgree = 0;
      let maxSnrErr = 0;
      let maxPdErr = 0;
      let finite = 0;
      // Deterministic sample of cells (a coprime stride through the grid).
      for (let s = 0; s < 4000; s++) {
        const i = (s * 7919) % (300 * 300);
        const col = i % 300;
        const row = Math.floor(i / 300);
        for (let k = 0; k < 3; k++) {
          const h = site.heightsAglM[k];
          const p = coveragePoint(
            {
              radar,
              target: quad,
              requirement: site.requirement,
              effectiveEarthFactor: 4 / 3,
              heightAglM: h,
            },
            {
              horizonSlope: horizon.horizonSlope[i],
              obstacleDistanceM: horizon.obstacleDistanceM[i],
              distanceM: horizon.distanceM[i],
              eastM: (col - 150) * c.cellM,
              northM: (150 - row) * c.cellM,
              groundM: ground[i],
              obstructionTopAglM: 0,
              cellSizeM: c.cellM,
            },
          );
          const snr = cov.heights[k].snrDbAt0Dbsm[i] + quad.rcsDbsm;
          const pd = cov.heights[k].targets[0].pd![i];
          const reason = cov.heights[k].targets[0].reason![i];
          if (reason === p.reason) reasonAgree++;
          compared++;
          if (Number.isFinite(snr) && Number.isFinite(p.snrDb) && p.snrDb > -40) {
            maxSnrErr = Math.max(maxSnrErr, Math.abs(snr - p.snrDb));
            maxPdErr = Math.max(maxPdErr, Math.abs(pd - p.pdExact));
            finite++;
          }
        }
      }
      // Table resolutions (coverage.ts): pattern bins ≤ 0.014°, knife edge ≤ 0.044 dB two way,
      // SNR-in-dB mantissa tables ≤ 0.002 dB (staring) and ≤ 0.0011 dB on 20·log10 R² (rotating); Pd-by-dB table
      // ≤ 1.25e-5 (pdDbTable.ts). Together well inside these bounds.
      console.info(
        `[CV2] ${c.model}: max |ΔSNR| ${maxSnrErr.toFixed(4)} dB, max |ΔPd| ${maxPdErr.toFixed(5)}, ` +
          `reasons agree ${((100 * reasonAgree) / compared).toFixed(2)} % (table path − exact path)`,
      );
      expect(finite).toBeGreaterThan(500);
      expect(maxSnrErr).toBeLessThan(0.1);
      expect(maxPdErr).toBeLessThan(0.01);
      // Reasons can differ only where a table bin straddles a field-of-view edge or the required Pd.
      expect(reasonAgree / compared).toBeGreaterThan(0.995);
    });
  }

  it("[CV3] the pseudo-angle bin grows with bearing through all four quadrants", () => {
    const bearings = [0.5, 44, 89.5, 91, 179, 181, 269, 271, 359.5];
    const bins = bearings.map((b) =>
      pseudoAngleBin(Math.sin((b * Math.PI) / 180), Math.cos((b * Math.PI) / 180)),
    );
    for (let i = 1; i < bins.length; i++) expect(bins[i]).toBeGreaterThan(bins[i - 1]);
  });
});

describe("reason codes", () => {
  it("[CV4] blind zone, out of range, out of sector, inside an obstruction, nodata, masked, too weak, covered", () => {
    const f = frameOf(400, 60, 5);
    const n = f.width * f.height;
    const ground = new Float32Array(n).fill(50);
    const top = new Float32Array(n);
    const row = 30;
    // A 40 m wall across the grid at column 120 (300 m east of the radar at column 60).
    for (let r = 0; r < f.height; r++) {
      top[r * f.width + 120] = 40;
      ground[r * f.width + 121] = 50;
    }
    // A roof of 20 m at column 80 and a nodata cell at column 90.
    top[row * f.width + 80] = 20;
    ground[row * f.width + 90] = Number.NaN;
    const at = cellXY(f, 60, row);
    const radar = placed(demoRadar("mossbee-58"), at, 50 + 13, { boresightAzDeg: 90, tiltDeg: 0 });
    const site = siteOf(f, ground, [radar], { top, heights: [10] });
    const cov = computeRadarCoverage(site, 0, "accurate");
    const reason = (col: number) => cov.heights[0].targets[0].reason![row * f.width + col];
    expect(reason(60)).toBe(Reason.blindZone); // own cell: slant range 3 m, inside the 5 m blind zone
    expect(reason(70)).toBe(Reason.covered); // 50 m east, in the beam
    expect(reason(80)).toBe(Reason.insideObstruction); // 10 m target under a 20 m roof
    expect(reason(90)).toBe(Reason.nodata);
    expect(reason(40)).toBe(Reason.outOfSector); // behind a staring radar
    expect(reason(130)).toBe(Reason.masked); // behind the wall
    expect(reason(399)).toBe(Reason.outOfRange); // 1.7 km: beyond the 800 m instrumented range
    // Clear sight but too far for Pd 0.8: 600 m to the east without the wall in the way.
    const clear = siteOf(f, new Float32Array(n).fill(50), [radar], { heights: [10] });
    const cov2 = computeRadarCoverage(clear, 0, "accurate");
    expect(cov2.heights[0].targets[0].reason![row * f.width + 180]).toBe(Reason.tooWeak);
    // Covered exactly where Pd meets the requirement.
    const pd = cov2.heights[0].targets[0].pd!;
    const rs = cov2.heights[0].targets[0].reason!;
    for (let i = 0; i < n; i++) expect(rs[i] === Reason.covered).toBe(pd[i] >= 0.8);
  });
});

describe("output reuse", () => {
  it("[CV9] writing into a previous result of the same shape gives exactly the fresh result", () => {
    const f = frameOf(120, 120, 5);
    const ground = roughGround(f);
    const m = demoRadar("mossbee-58");
    const a = placed(m, cellXY(f, 30, 30), 150, { id: "a", boresightAzDeg: 135 });
    const b = placed(m, cellXY(f, 90, 80), 140, { id: "b", boresightAzDeg: 300 });
    const site = siteOf(f, ground, [a, b]);
    const run = (radar: typeof a, reuse?: ReturnType<typeof radarCoverageFromHorizon>) => {
      const { kernel, horizon } = stageOf(site, radar, { clipToReach: true });
      return radarCoverageFromHorizon(
        { ...site, radar, effectiveEarthFactor: 4 / 3 },
        kernel,
        horizon,
        reuse,
      );
    };
    const fresh = run(b);
    const old = run(a);
    const reused = run(b, old);
    expect(reused).toBe(old);
    expect(reused.radarId).toBe("b");
    const same = (x: ArrayLike<number>, y: ArrayLike<number>) =>
      Array.from(x).every((v, i) => Object.is(v, y[i]) || (Number.isNaN(v) && Number.isNaN(y[i])));
    expect(same(reused.lowestVisibleHeightAglM, fresh.lowestVisibleHeightAglM)).toBe(true);
    for (let k = 0; k < 3; k++) {
      expect(same(reused.heights[k].snrDbAt0Dbsm, fresh.heights[k].snrDbAt0Dbsm)).toBe(true);
      expect(same(reused.heights[k].targets[0].pd!, fresh.heights[k].targets[0].pd!)).toBe(true);
      expect(same(reused.heights[k].targets[0].reason!, fresh.heights[k].targets[0].reason!)).toBe(true);
    }
  });
});

describe("several target classes", () => {
  for (const model of ["kalvori-x9", "mossbee-58"] as const) {
    it(`[CV2] ${model}: a second class leaves the first unchanged; its Pd is the table Pd of SNR + its RCS`, () => {
      const f = frameOf(160, 160, model === "kalvori-x9" ? 20 : 2);
      const ground = roughGround(f);
      const radar = placed(demoRadar(model), cellXY(f, 80, 80), ground[80 * 160 + 80] + 20, {
        boresightAzDeg: 30,
      });
      const one = siteOf(f, ground, [radar]);
      const two = siteOf(f, ground, [radar], { targets: [quad, fixedWing] });
      const stage = (site: typeof one) => {
        const { kernel, horizon } = stageOf(site, radar);
        return radarCoverageFromHorizon({ ...site, radar, effectiveEarthFactor: 4 / 3 }, kernel, horizon);
      };
      const a = stage(one);
      const b = stage(two);
      // The detection table of the second class (the stage reads the same cached table).
      const table = cachedPdDbTable(two.requirement.pfa, two.requirement.looks, fixedWing.swerling);
      let compared = 0;
      for (let k = 0; k < 3; k++) {
        const h = two.heightsAglM[k];
        expect(Array.from(b.heights[k].snrDbAt0Dbsm)).toEqual(Array.from(a.heights[k].snrDbAt0Dbsm));
        expect(Array.from(b.heights[k].targets[0].pd!)).toEqual(Array.from(a.heights[k].targets[0].pd!));
        expect(Array.from(b.heights[k].targets[0].reason!)).toEqual(
          Array.from(a.heights[k].targets[0].reason!),
        );
        const fw = b.heights[k].targets[1];
        if (!fixedWing.heightsAglM.includes(h)) {
          expect(fw.pd).toBeNull();
          continue;
        }
        const snr = b.heights[k].snrDbAt0Dbsm;
        for (let i = 0; i < snr.length; i += 3) {
          if (!Number.isFinite(snr[i])) continue;
          // The stage adds the RCS to the SNR before rounding to Float32: within one Float32 step.
          expect(Math.abs(fw.pd![i] - pdFromSnrDb(table, snr[i] + fixedWing.rcsDbsm))).toBeLessThan(1e-5);
          compared++;
        }
      }
      expect(compared).toBeGreaterThan(1000);
    });
  }
});
