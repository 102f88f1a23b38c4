/**
 * Writes plan.json of the two invented demo sites from their layouts in local metres:
 *   demo-sites/ridge-waterworks/plan.json   (hilly ground, DEM from scripts/make-demo-dem.ts)
 *   demo-sites/container-terminal/plan.json (flat ground, tall container stacks and silos)
 * Radar models are copied from demo-sites/radars/*.json (posts refer to them by id), so a plan file
 * is complete on its own. Every name, place and radar is invented.
 *
 *   npx tsx scripts/make-demo-plans.ts
 */
import { readFileSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import proj4 from "proj4";
import { RIDGE_SITE_CRS, ridgeCentreUtm } from "./make-demo-dem.ts";

const here = dirname(fileURLToPath(import.meta.url));
const demoDir = join(here, "..", "demo-sites");

type Lonlat = [number, number];
type Local = [number, number];

function converter(crs: string, centre: [number, number]) {
  const conv = proj4("WGS84", crs);
  return (p: Local): Lonlat => {
    const [lon, lat] = conv.inverse([centre[0] + p[0], centre[1] + p[1]]);
    return [Math.round(lon * 1e7) / 1e7, Math.round(lat * 1e7) / 1e7];
  };
}

/** A closed ring of a rectangle centred on (e, n), w × h m, rotated clockwise by rotDeg. */
function rect(e: number, n: number, w: number, h: number, rotDeg = 0): Local[] {
  const a = (rotDeg * Math.PI) / 180;
  const corners: Local[] = [
    [-w / 2, -h / 2],
    [w / 2, -h / 2],
    [w / 2, h / 2],
    [-w / 2, h / 2],
  ].map(([x, y]) => [e + x * Math.cos(a) + y * Math.sin(a), n - x * Math.sin(a) + y * Math.cos(a)] as Local);
  return [...corners, corners[0]];
}

/** A closed ring approximating a circle with `sides` corners. */
function circle(e: number, n: number, r: number, sides = 12): Local[] {
  const ring: Local[] = [];
  for (let k = 0; k < sides; k++) {
    const a = (2 * Math.PI * k) / sides;
    ring.push([e + r * Math.cos(a), n + r * Math.sin(a)]);
  }
  return [...ring, ring[0]];
}

function radar(id: string): unknown {
  const files: Record<string, string> = {
    "kalvori-x9": "kalvori-x9-rotating-pulsed.json",
    "mossbee-58": "mossbee-58-patch-fmcw.json",
    "zorvane-s24": "zorvane-s24-staring-fmcw.json",
  };
  return JSON.parse(readFileSync(join(demoDir, "radars", files[id]), "utf8"));
}

interface PostSpec {
  id: string;
  name: string;
  at: Local;
  mounting: "ground" | "roof";
  mastHeightM: number;
  radarModelId: string;
  boresightAzDeg: number;
  tiltDeg: number;
  enabled?: boolean;
}

interface BuildingSpec {
  name: string;
  ring: Local[];
  heightM: number;
}

function planOf(p: {
  name: string;
  notes: string;
  toLonLat: (l: Local) => Lonlat;
  protectedRing: Local[];
  ringDepthM: number;
  posts: PostSpec[];
  buildings: BuildingSpec[];
  trees: { id: string; name: string; ring: Local[]; canopyHeightM: number }[];
  targetClasses: unknown[];
  requirement: unknown;
  ground: unknown;
  analysis: unknown;
}) {
  const modelIds = [...new Set(p.posts.map((q) => q.radarModelId))].sort();
  const poly = (ring: Local[]) => ({ type: "Polygon", coordinates: [ring.map(p.toLonLat)] });
  return {
    version: 1,
    site: { name: p.name, notes: p.notes },
    protectedAreas: [{ id: "site", name: `${p.name} fence line`, geometry: poly(p.protectedRing) }],
    approachRingDepthM: p.ringDepthM,
    posts: p.posts.map((q) => {
      const [lonDeg, latDeg] = p.toLonLat(q.at);
      return {
        id: q.id,
        name: q.name,
        position: { lonDeg, latDeg },
        mounting: q.mounting,
        mastHeightM: q.mastHeightM,
        radarModelId: q.radarModelId,
        boresightAzDeg: q.boresightAzDeg,
        tiltDeg: q.tiltDeg,
        enabled: q.enabled ?? true,
      };
    }),
    radarModels: modelIds.map(radar),
    targetClasses: p.targetClasses,
    requirement: p.requirement,
    terrain: {
      ground: p.ground,
      buildings: {
        type: "FeatureCollection",
        features: p.buildings.map((b, k) => ({
          type: "Feature",
          id: `b${k + 1}`,
          geometry: poly(b.ring),
          properties: { name: b.name, height: b.heightM },
        })),
      },
      treeStands: p.trees.map((t) => ({
        id: t.id,
        name: t.name,
        geometry: poly(t.ring),
        canopyHeightM: t.canopyHeightM,
      })),
    },
    analysis: p.analysis,
  };
}

const quadcopter = {
  id: "quad",
  name: "Small quadcopter (invented class)",
  rcsDbsm: -20,
  swerling: 1,
  speedMPerS: 15,
  heightsAglM: [10, 30, 60],
};
const fixedWing = {
  id: "fixed-wing",
  name: "Fixed-wing survey drone (invented class)",
  rcsDbsm: -10,
  swerling: 1,
  speedMPerS: 25,
  heightsAglM: [10, 30, 60],
};

function ridgeWaterworks() {
  const toLonLat = converter(RIDGE_SITE_CRS, ridgeCentreUtm());
  const buildings: BuildingSpec[] = [
    { name: "Filter hall A (invented)", ring: rect(-120, 60, 80, 30), heightM: 14 },
    { name: "Pump hall B (invented)", ring: rect(80, 80, 60, 40), heightM: 12 },
    { name: "Digester tower 1 (invented)", ring: circle(-10, -60, 12), heightM: 28 },
    { name: "Digester tower 2 (invented)", ring: circle(40, -60, 12), heightM: 28 },
    { name: "Control building (invented)", ring: rect(-180, -120, 30, 20), heightM: 8 },
    { name: "Water tower (invented)", ring: circle(200, -120, 9, 10), heightM: 35 },
    { name: "Settling tank house (invented)", ring: rect(150, 20, 40, 50, 15), heightM: 9 },
    // A hamlet west of the fence.
    ...[0, 1, 2, 3, 4].map((k) => ({
      name: `Hamlet house ${k + 1} (invented)`,
      ring: rect(-520 + 35 * k, -90 + 18 * (k % 2), 14, 10, 10),
      heightM: 8,
    })),
    { name: "Grain shed (invented)", ring: rect(-430, 260, 40, 25), heightM: 11 },
  ];
  return planOf({
    name: "Ridge waterworks (invented demo site)",
    notes:
      "Invented scenario: a water treatment works in a valley with a ridge just east of the fence. No real facility; coordinates in open desert.",
    toLonLat,
    protectedRing: [
      [-240, -160],
      [240, -160],
      [240, 120],
      [160, 160],
      [-240, 160],
      [-240, -160],
    ],
    ringDepthM: 400,
    posts: [
      {
        id: "nw-knoll",
        name: "North-west knoll mast",
        at: [-1700, 900],
        mounting: "ground",
        mastHeightM: 12,
        radarModelId: "kalvori-x9",
        boresightAzDeg: 0,
        tiltDeg: -2,
      },
      {
        id: "ridge-crest",
        name: "Ridge crest mast (candidate)",
        at: [440, -40],
        mounting: "ground",
        mastHeightM: 8,
        radarModelId: "zorvane-s24",
        boresightAzDeg: 90,
        tiltDeg: -6,
        enabled: false,
      },
      {
        id: "hall-a-roof",
        name: "Filter hall A roof",
        at: [-120, 60],
        mounting: "roof",
        mastHeightM: 17,
        radarModelId: "mossbee-58",
        boresightAzDeg: 300,
        tiltDeg: 3,
      },
      {
        id: "hall-b-roof",
        name: "Pump hall B roof",
        at: [80, 80],
        mounting: "roof",
        mastHeightM: 15,
        radarModelId: "mossbee-58",
        boresightAzDeg: 45,
        tiltDeg: 3,
      },
      {
        id: "south-gate",
        name: "South gate mast",
        at: [0, -190],
        mounting: "ground",
        mastHeightM: 10,
        radarModelId: "mossbee-58",
        boresightAzDeg: 180,
        tiltDeg: 3,
      },
      {
        id: "east-fence",
        name: "East fence mast",
        at: [235, -20],
        mounting: "ground",
        mastHeightM: 12,
        radarModelId: "mossbee-58",
        boresightAzDeg: 100,
        tiltDeg: 4,
      },
      {
        id: "west-fence",
        name: "West fence mast",
        at: [-235, -20],
        mounting: "ground",
        mastHeightM: 12,
        radarModelId: "mossbee-58",
        boresightAzDeg: 250,
        tiltDeg: 3,
      },
      {
        id: "tower-top",
        name: "Water tower top",
        at: [200, -120],
        mounting: "roof",
        mastHeightM: 37,
        radarModelId: "zorvane-s24",
        boresightAzDeg: 200,
        tiltDeg: -8,
      },
      {
        id: "spare-north",
        name: "North fence spare post",
        at: [0, 165],
        mounting: "ground",
        mastHeightM: 10,
        radarModelId: "mossbee-58",
        boresightAzDeg: 0,
        tiltDeg: 3,
        enabled: false,
      },
    ],
    buildings,
    trees: [
      {
        id: "shelter-belt",
        name: "Shelter belt (invented)",
        ring: rect(-60, 235, 320, 25),
        canopyHeightM: 12,
      },
    ],
    targetClasses: [quadcopter, fixedWing],
    requirement: { requiredPd: 0.8, pfa: 1e-6, looks: 1 },
    ground: { type: "dem", file: "terrain.tif", kind: "geotiff", surface: "DTM" },
    analysis: {
      cellSizeM: 10,
      effectiveEarthFactor: 4 / 3,
      targetHeightsM: [10, 30, 60],
      maskMode: "accurate",
      marginM: 200,
    },
  });
}

function containerTerminal() {
  const crs = "+proj=utm +zone=52 +south +datum=WGS84 +units=m +no_defs";
  const [x, y] = proj4("WGS84", crs, [128.3, -30.95]);
  const toLonLat = converter(crs, [Math.round(x / 5) * 5, Math.round(y / 5) * 5]);
  const buildings: BuildingSpec[] = [];
  // Container yard: 6 rows × 6 bays of stacks, 42 m × 15 m, five high (13 m) or three high (7.8 m).
  for (let r = 0; r < 6; r++) {
    for (let b = 0; b < 6; b++) {
      const e = -200 + b * 62;
      const n = -100 + r * 30;
      const heightM = (r * 6 + b) % 4 === 0 ? 7.8 : 13;
      buildings.push({
        name: `Stack row ${r + 1} bay ${b + 1} (invented)`,
        ring: rect(e, n, 42, 15),
        heightM,
      });
    }
  }
  // Grain silos and a transit shed on the east side.
  for (const k of [0, 1, 2]) {
    buildings.push({ name: `Silo ${k + 1} (invented)`, ring: circle(185 + 24 * k, 112, 10.5), heightM: 45 });
  }
  buildings.push({ name: "Transit shed (invented)", ring: rect(205, -75, 60, 90), heightM: 16 });
  buildings.push({ name: "Gate house (invented)", ring: rect(-232, -132, 16, 10), heightM: 6 });
  const toCentre = (e: number, n: number) => ((Math.atan2(-e, -n) * 180) / Math.PI + 360) % 360;
  const pole = (id: string, name: string, at: Local): PostSpec => ({
    id,
    name,
    at,
    mounting: "ground",
    mastHeightM: 25,
    radarModelId: "mossbee-58",
    boresightAzDeg: Math.round(toCentre(at[0], at[1])),
    tiltDeg: 0,
  });
  return planOf({
    name: "Container terminal (invented demo site)",
    notes:
      "Invented scenario: a dry container terminal on a flat plain, stacks three and five high, three silos. No real facility; coordinates in open country.",
    toLonLat,
    protectedRing: [
      [-250, -150],
      [250, -150],
      [250, 150],
      [-250, 150],
      [-250, -150],
    ],
    ringDepthM: 150,
    posts: [
      pole("pole-nw", "North-west light pole", [-245, 145]),
      pole("pole-ne", "North-east light pole", [245, 145]),
      pole("pole-sw", "South-west light pole", [-245, -145]),
      pole("pole-se", "South-east light pole", [245, -145]),
      { ...pole("pole-mid-n", "Mid-yard north pole", [-20, 71]), boresightAzDeg: 180, tiltDeg: -4 },
      { ...pole("pole-mid-s", "Mid-yard south pole", [-20, -71]), boresightAzDeg: 0, tiltDeg: -4 },
      {
        id: "silo-top",
        name: "Silo 2 top",
        at: [209, 112],
        mounting: "roof",
        mastHeightM: 48,
        radarModelId: "zorvane-s24",
        boresightAzDeg: 240,
        tiltDeg: -20,
      },
      {
        id: "shed-roof",
        name: "Transit shed roof",
        at: [205, -75],
        mounting: "roof",
        mastHeightM: 19,
        radarModelId: "mossbee-58",
        boresightAzDeg: 90,
        tiltDeg: 0,
      },
      {
        id: "outer-west",
        name: "Outer mast 1.8 km west",
        at: [-1800, 0],
        mounting: "ground",
        mastHeightM: 20,
        radarModelId: "kalvori-x9",
        boresightAzDeg: 90,
        tiltDeg: 0,
      },
      {
        id: "pole-gate",
        name: "Gate light pole (candidate)",
        at: [-250, -40],
        mounting: "ground",
        mastHeightM: 20,
        radarModelId: "mossbee-58",
        boresightAzDeg: 270,
        tiltDeg: 0,
        enabled: false,
      },
    ],
    buildings,
    trees: [],
    targetClasses: [quadcopter, { ...fixedWing, heightsAglM: [30, 60] }],
    requirement: { requiredPd: 0.8, pfa: 1e-6, looks: 1 },
    ground: { type: "flat", elevationAmslM: 62 },
    analysis: {
      cellSizeM: 5,
      effectiveEarthFactor: 4 / 3,
      targetHeightsM: [10, 30, 60],
      maskMode: "accurate",
      marginM: 150,
    },
  });
}

function write(dir: string, plan: unknown): void {
  const out = join(demoDir, dir, "plan.json");
  writeFileSync(out, `${JSON.stringify(plan, null, 2)}\n`);
  console.log(`wrote ${out}`);
}

write("ridge-waterworks", ridgeWaterworks());
write("container-terminal", containerTerminal());
