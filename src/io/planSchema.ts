/**
 * The plan document, format version PLAN_VERSION: the zod schema and the TypeScript types.
 * One JSON file holds a whole site: protected areas, approach ring, posts, radar models, target
 * classes, the requirement, terrain and analysis settings. Every field is documented with its
 * unit in docs/plan-format.md; the JSON Schema is docs/plan.schema.json (scripts/export-plan-schema.ts).
 * This module checks single fields; rules across fields (references, polygon kinks, heights
 * against the analysis list) are in planValidation.ts. Older versions are migrated in planMigrations.ts.
 */
import { z } from "zod";
import {
  DEFAULT_EFFECTIVE_EARTH_FACTOR,
  MAX_EFFECTIVE_EARTH_FACTOR,
  MIN_EFFECTIVE_EARTH_FACTOR,
} from "../coverage/constants.ts";
import type { RadarModel } from "../coverage/radarModel.ts";
import { polygonProblems } from "./polygonRules.ts";
import { radarModelSchema } from "./radarSchema.ts";
import { describeValue, displayName, identifier, oneOf, quantity, record } from "./schemaFields.ts";

/** The plan format version this build writes and reads (older versions are migrated). */
export const PLAN_VERSION = 1;

/** Mast height limit, m AGL: taller than the tallest guyed masts used for surveillance sensors (plausibility). */
export const MAX_MAST_HEIGHT_M = 300;

// ---------------------------------------------------------------------------------------------
// Types (the schema below is checked to produce exactly these)

/** A GeoJSON position (RFC 7946 §3.1.1): [longitude, latitude] in decimal degrees WGS84, optional altitude. */
export type Position = number[];

/** GeoJSON Polygon (RFC 7946 §3.1.6): outer ring first, then holes; each ring closed. */
export interface PolygonGeometry {
  type: "Polygon";
  coordinates: Position[][];
  bbox?: number[];
}

/** GeoJSON MultiPolygon (RFC 7946 §3.1.7). */
export interface MultiPolygonGeometry {
  type: "MultiPolygon";
  coordinates: Position[][][];
  bbox?: number[];
}

export type AreaGeometry = PolygonGeometry | MultiPolygonGeometry;

export interface ProtectedArea {
  id: string;
  name: string;
  geometry: AreaGeometry;
}

export interface LonLat {
  /** Longitude, decimal degrees WGS84, [-180, 180]. */
  lonDeg: number;
  /** Latitude, decimal degrees WGS84, [-90, 90]. */
  latDeg: number;
}

/** A scan sector that overrides the radar model's: centre azimuth and width, degrees clockwise from true north. */
export interface ScanSectorOverride {
  centreAzDeg: number;
  widthDeg: number;
}

/** A candidate position with its radar. Give exactly one of radarModelId and radarModel. */
export interface Post {
  id: string;
  name: string;
  position: LonLat;
  /** "ground": on a mast at ground level; "roof": on a building, whose own roof never masks this radar. */
  mounting: "ground" | "roof";
  /** Antenna height above the ground at the post (AGL), m, [0, 300]; for a roof post it includes the building. */
  mastHeightM: number;
  /** Id of a model in `radarModels`. */
  radarModelId?: string;
  /** A model given inline, for this post only. */
  radarModel?: RadarModel;
  /** Boresight azimuth, degrees clockwise from true north, [0, 360). */
  boresightAzDeg: number;
  /** Tilt of the boresight above the horizontal, degrees, [-90, 90] (negative: down). */
  tiltDeg: number;
  scanSector?: ScanSectorOverride;
  /** Disabled posts stay in the plan but take no part in a run. */
  enabled: boolean;
}

export interface TargetClass {
  id: string;
  name: string;
  /** Mean radar cross-section, dBsm. */
  rcsDbsm: number;
  /** Swerling fluctuation case 0 (steady) to 4. */
  swerling: 0 | 1 | 2 | 3 | 4;
  /** Speed used for warning time, m/s. */
  speedMPerS: number;
  /** Heights above ground this class is judged at, m; each one of analysis.targetHeightsM. */
  heightsAglM: number[];
}

export interface Requirement {
  /** Required probability of detection, (0, 1). */
  requiredPd: number;
  /** Probability of false alarm per cell and look, (0, 0.1]. */
  pfa: number;
  /** Looks integrated non-coherently for the detection decision, ≥ 1. */
  looks: number;
  /** Target classes the requirement applies to; absent: all. */
  targetClassIds?: string[];
}

/** Ground from a digital elevation model file. */
export interface DemGround {
  type: "dem";
  /** File name of the DEM, resolved beside the plan file or from the app's store. */
  file: string;
  kind: "geotiff" | "hgt" | "asc";
  /** "DTM": bare earth (buildings and trees are added); "DSM": surface already includes them. */
  surface: "DTM" | "DSM";
}

/** Flat ground at one elevation (no DEM). */
export interface FlatGround {
  type: "flat";
  /** Ground elevation above mean sea level, m. */
  elevationAmslM: number;
}

export interface BuildingProperties {
  /** Height of the roof above ground, m. */
  height?: number;
  /** Storeys above ground, used when `height` is absent (× metres per level). */
  "building:levels"?: number;
  /** Height of the underside above ground (bridges, overhangs), m. */
  min_height?: number;
  [key: string]: unknown;
}

export interface BuildingFeature {
  type: "Feature";
  id?: string | number;
  geometry: AreaGeometry;
  properties: BuildingProperties;
}

export interface BuildingCollection {
  type: "FeatureCollection";
  features: BuildingFeature[];
}

export interface TreeStand {
  id: string;
  name?: string;
  geometry: AreaGeometry;
  /** Canopy height above ground, m. */
  canopyHeightM: number;
}

export interface Terrain {
  ground: DemGround | FlatGround;
  buildings: BuildingCollection;
  treeStands: TreeStand[];
}

export interface AnalysisSettings {
  /** Square cell side, m, or "auto" (chosen to cap the cell count; see siteGrid.ts). */
  cellSizeM: number | "auto";
  /** Effective-Earth-radius factor k (4/3 standard atmosphere; 1 geometric). */
  effectiveEarthFactor: number;
  /** Target heights above ground the maps are computed at, m, distinct. */
  targetHeightsM: number[];
  /** "accurate" for reports, "fast" for previews. */
  maskMode: "accurate" | "fast";
  /** Margin of the grid beyond the approach ring and the posts, m; absent: the default of siteGrid.ts. */
  marginM?: number;
}

export interface Plan {
  version: typeof PLAN_VERSION;
  site: { name: string; notes?: string };
  protectedAreas: ProtectedArea[];
  /** Depth of the approach ring around the protected areas, m. */
  approachRingDepthM: number;
  posts: Post[];
  radarModels: RadarModel[];
  targetClasses: TargetClass[];
  requirement: Requirement;
  terrain: Terrain;
  analysis: AnalysisSettings;
}

// ---------------------------------------------------------------------------------------------
// Schema

const lonDeg = quantity({
  unit: "deg",
  min: -180,
  max: 180,
  description: "Longitude, decimal degrees WGS84",
});
const latDeg = quantity({ unit: "deg", min: -90, max: 90, description: "Latitude, decimal degrees WGS84" });

/** A GeoJSON position [lon, lat] or [lon, lat, altitude]; a latitude beyond ±90 hints at swapped axes. */
const positionSchema = z
  .array(z.number({ error: (iss) => `must be a finite number (got ${describeValue(iss.input)})` }), {
    error: (iss) => `must be a position [lon, lat] (got ${describeValue(iss.input)})`,
  })
  .min(2, { error: "must be a position [lon, lat] (too few numbers)" })
  .max(3, { error: "must be a position [lon, lat] or [lon, lat, altitude] (too many numbers)" })
  .superRefine((p, ctx) => {
    if (!Array.isArray(p) || p.length < 2) return;
    if (!(p[0] >= -180 && p[0] <= 180)) {
      ctx.addIssue({ code: "custom", path: [0], message: `longitude ${p[0]} is outside [-180, 180] deg` });
    }
    if (!(p[1] >= -90 && p[1] <= 90)) {
      const swapped =
        p[0] >= -90 && p[0] <= 90 ? " (GeoJSON positions are [lon, lat]; are they swapped?)" : "";
      ctx.addIssue({
        code: "custom",
        path: [1],
        message: `latitude ${p[1]} is outside [-90, 90] deg${swapped}`,
      });
    }
  })
  .meta({ description: "GeoJSON position [longitude, latitude] in decimal degrees WGS84 (RFC 7946)" });

const ringSchema = z
  .array(positionSchema, { error: "must be a linear ring (an array of positions)" })
  .min(4, { error: "a ring needs at least 4 positions (3 corners and the closing position)" })
  .superRefine((ring, ctx) => {
    if (ring.length < 4) return;
    const a = ring[0];
    const b = ring[ring.length - 1];
    if (!Array.isArray(a) || !Array.isArray(b)) return;
    if (a[0] !== b[0] || a[1] !== b[1]) {
      ctx.addIssue({
        code: "custom",
        path: [ring.length - 1],
        message: "the ring is not closed (the last position must repeat the first)",
      });
    }
  });

const bboxSchema = z.array(z.number()).optional().meta({ description: "GeoJSON bounding box (ignored)" });

export const polygonSchema = z
  .object({
    type: z.literal("Polygon"),
    coordinates: z.array(ringSchema).min(1, { error: "a polygon needs an outer ring" }),
    bbox: bboxSchema,
  })
  .superRefine((g, ctx) => {
    for (const p of polygonProblems(g.coordinates, ["coordinates"])) ctx.addIssue({ code: "custom", ...p });
  })
  .meta({ description: "GeoJSON Polygon in WGS84 lon/lat; the first ring is the outline, the others holes" });

export const multiPolygonSchema = z
  .object({
    type: z.literal("MultiPolygon"),
    coordinates: z
      .array(z.array(ringSchema).min(1, { error: "a polygon needs an outer ring" }))
      .min(1, { error: "a multipolygon needs at least one polygon" }),
    bbox: bboxSchema,
  })
  .superRefine((g, ctx) => {
    g.coordinates.forEach((rings, i) => {
      for (const p of polygonProblems(rings, ["coordinates", i])) ctx.addIssue({ code: "custom", ...p });
    });
  })
  .meta({ description: "GeoJSON MultiPolygon in WGS84 lon/lat" });

export const areaGeometrySchema = z.discriminatedUnion("type", [polygonSchema, multiPolygonSchema], {
  error: (iss) =>
    iss.code === "invalid_union"
      ? `type must be "Polygon" or "MultiPolygon"`
      : "is required (a GeoJSON geometry)",
});

/** The radar model as the plan holds it; one entry in the JSON Schema's $defs. */
const planRadarModelSchema = radarModelSchema.meta({
  id: "RadarModel",
  description: "A radar model (the same fields as a radar model file)",
});

/** Area geometry as the plan holds it; one entry in the JSON Schema's $defs. */
const planAreaGeometrySchema = areaGeometrySchema.meta({
  id: "AreaGeometry",
  description: "GeoJSON Polygon or MultiPolygon, WGS84 lon/lat (RFC 7946)",
});

/** Highest target height a plan may judge, m above ground. */
export const MAX_TARGET_HEIGHT_M = 10_000;

const heightAglM = quantity({
  unit: "m",
  min: 0,
  max: MAX_TARGET_HEIGHT_M,
  description: "Height above ground, m",
});

const protectedAreaSchema = record(
  {
    id: identifier("Identifier of the area"),
    name: displayName("Display name"),
    geometry: planAreaGeometrySchema,
  },
  "A protected area",
);

const postSchema = record(
  {
    id: identifier("Identifier of the post"),
    name: displayName("Display name"),
    position: record({ lonDeg, latDeg }, "Position of the mast foot, WGS84"),
    mounting: oneOf(
      ["ground", "roof"],
      "Ground mast or roof mount (a roof post's own building never masks it)",
    ),
    mastHeightM: quantity({
      unit: "m",
      min: 0,
      max: MAX_MAST_HEIGHT_M,
      description: "Antenna height above ground at the post (AGL), m; includes the building for a roof post",
    }),
    radarModelId: identifier("Id of a model in radarModels").optional(),
    radarModel: planRadarModelSchema.optional(),
    boresightAzDeg: quantity({
      unit: "deg",
      min: 0,
      lt: 360,
      description: "Boresight azimuth, degrees clockwise from true north, [0, 360)",
    }),
    tiltDeg: quantity({
      unit: "deg",
      min: -90,
      max: 90,
      description: "Boresight tilt above the horizontal, degrees (negative: down)",
    }),
    scanSector: record(
      {
        centreAzDeg: quantity({
          unit: "deg",
          min: 0,
          lt: 360,
          description: "Centre of the sector, degrees clockwise from true north",
        }),
        widthDeg: quantity({ unit: "deg", gt: 0, max: 360, description: "Width of the sector, degrees" }),
      },
      "Scan sector overriding the radar model's",
    ).optional(),
    enabled: z
      .boolean({ error: "must be true or false" })
      .default(true)
      .meta({ description: "Takes part in runs" }),
  },
  "A candidate post with its radar",
);

const targetClassSchema = record(
  {
    id: identifier("Identifier of the target class"),
    name: displayName("Display name"),
    rcsDbsm: quantity({ unit: "dBsm", min: -60, max: 60, description: "Mean radar cross-section, dBsm" }),
    swerling: z
      .literal([0, 1, 2, 3, 4], {
        error: (iss) => `must be a Swerling case 0, 1, 2, 3 or 4 (got ${describeValue(iss.input)})`,
      })
      .meta({ description: "Swerling fluctuation case, 0 (steady) to 4" }),
    speedMPerS: quantity({ unit: "m/s", gt: 0, max: 1000, description: "Target speed, m/s" }),
    heightsAglM: z
      .array(heightAglM)
      .min(1, { error: "needs at least one height" })
      .meta({ description: "Heights above ground this class is judged at, m" }),
  },
  "A target class",
);

const requirementSchema = record(
  {
    requiredPd: quantity({
      unit: "",
      gt: 0,
      lt: 1,
      description: "Required probability of detection, (0, 1)",
    }),
    pfa: quantity({ unit: "", gt: 0, max: 0.1, description: "Probability of false alarm, (0, 0.1]" }),
    looks: quantity({
      unit: "",
      integer: true,
      min: 1,
      max: 1000,
      description: "Looks integrated non-coherently for the detection decision",
    }),
    targetClassIds: z
      .array(identifier("Id of a target class"))
      .optional()
      .meta({ description: "Target classes the requirement applies to (absent: all)" }),
  },
  "The detection requirement",
);

const groundSchema = z.discriminatedUnion(
  "type",
  [
    record(
      {
        type: z.literal("dem"),
        file: z
          .string({ error: "must be a file name" })
          .min(1, { error: "must not be empty" })
          .meta({ description: "DEM file name" }),
        kind: oneOf(["geotiff", "hgt", "asc"], "DEM file format: GeoTIFF, SRTM .hgt or Esri ASCII grid"),
        surface: oneOf(["DTM", "DSM"], "Bare earth (DTM) or surface with buildings and trees (DSM)"),
      },
      "Ground from a DEM file",
    ),
    record(
      {
        type: z.literal("flat"),
        elevationAmslM: quantity({
          unit: "m",
          min: -500,
          max: 9000,
          description: "Ground elevation above mean sea level, m",
        }),
      },
      "Flat ground at one elevation",
    ),
  ],
  {
    error: (iss) =>
      iss.code === "invalid_union"
        ? `type must be "dem" or "flat"`
        : "is required (a DEM reference or flat ground)",
  },
);

const buildingPropertiesSchema = z
  .looseObject({
    height: quantity({ unit: "m", min: 0, max: 1000, description: "Roof height above ground, m" }).optional(),
    "building:levels": quantity({
      unit: "",
      integer: true,
      min: 0,
      max: 300,
      description: "Storeys above ground (used when height is absent)",
    }).optional(),
    min_height: quantity({
      unit: "m",
      min: 0,
      max: 1000,
      description: "Underside height above ground, m",
    }).optional(),
    heightSource: oneOf(
      ["levels", "default"] as const,
      "An imported height made from building:levels or the default, not given by the file",
    ).optional(),
  })
  .meta({ description: "Building properties (OSM tag names); other properties are kept" });

const buildingFeatureSchema = z
  .object({
    type: z.literal("Feature"),
    id: z.union([z.string(), z.number()]).optional(),
    geometry: planAreaGeometrySchema,
    properties: buildingPropertiesSchema.default({}),
  })
  .meta({ description: "A building footprint (GeoJSON Feature)" });

const terrainSchema = record(
  {
    ground: groundSchema,
    buildings: z
      .object({
        type: z.literal("FeatureCollection"),
        features: z.array(buildingFeatureSchema),
      })
      .default({ type: "FeatureCollection", features: [] })
      .meta({ description: "Building footprints (GeoJSON FeatureCollection, WGS84)" }),
    treeStands: z
      .array(
        record(
          {
            id: identifier("Identifier of the tree stand"),
            name: displayName("Display name").optional(),
            geometry: planAreaGeometrySchema,
            canopyHeightM: quantity({
              unit: "m",
              gt: 0,
              max: 150,
              description: "Canopy height above ground, m",
            }),
          },
          "A tree stand",
        ),
      )
      .default([]),
  },
  "Terrain: ground, buildings and tree stands",
);

const analysisSchema = record(
  {
    cellSizeM: z
      .union(
        [z.literal("auto"), quantity({ unit: "m", min: 0.5, max: 1000, description: "Square cell side, m" })],
        { error: (iss) => `must be "auto" or a cell size in m (got ${describeValue(iss.input)})` },
      )
      .default("auto")
      .meta({ description: 'Square cell side in m, or "auto"' }),
    effectiveEarthFactor: quantity({
      unit: "",
      min: MIN_EFFECTIVE_EARTH_FACTOR,
      max: MAX_EFFECTIVE_EARTH_FACTOR,
      description: "Effective-Earth-radius factor k (4/3 standard; 1 geometric; large values approach flat)",
    }).default(DEFAULT_EFFECTIVE_EARTH_FACTOR),
    targetHeightsM: z
      .array(heightAglM)
      .min(1, { error: "needs at least one height" })
      .meta({ description: "Target heights above ground the maps are computed at, m" }),
    maskMode: oneOf(["accurate", "fast"], "Masking mode: accurate for reports, fast for previews").default(
      "accurate",
    ),
    marginM: quantity({
      unit: "m",
      min: 0,
      max: 50000,
      description: "Grid margin beyond the approach ring and the posts, m",
    }).optional(),
  },
  "Analysis settings",
);

/** The zod schema of a plan document of the current version (single-field rules only). */
export const planSchema = record(
  {
    version: z
      .literal(PLAN_VERSION, { error: `must be ${PLAN_VERSION}` })
      .meta({ description: "Plan format version" }),
    site: record(
      {
        name: displayName("Site name"),
        notes: z.string().max(10000).optional().meta({ description: "Free notes" }),
      },
      "The site",
    ),
    protectedAreas: z
      .array(protectedAreaSchema)
      .min(1, { error: "needs at least one protected area" })
      .meta({ description: "Protected areas (GeoJSON polygons)" }),
    approachRingDepthM: quantity({
      unit: "m",
      min: 0,
      max: 50000,
      description: "Depth of the approach ring around the protected areas, m",
    }),
    posts: z.array(postSchema).default([]).meta({ description: "Candidate posts" }),
    radarModels: z
      .array(planRadarModelSchema)
      .default([])
      .meta({ description: "Radar models posts refer to by id" }),
    targetClasses: z
      .array(targetClassSchema)
      .min(1, { error: "needs at least one target class" })
      .meta({ description: "Target classes" }),
    requirement: requirementSchema,
    terrain: terrainSchema,
    analysis: analysisSchema,
  },
  "A Picket plan document",
);

// Compile-time proof that the schema produces exactly the types above.
type Exactly<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const planTypeMatches: Exactly<z.output<typeof planSchema>, Plan> = true;
const postTypeMatches: Exactly<z.output<typeof postSchema>, Post> = true;
const targetTypeMatches: Exactly<z.output<typeof targetClassSchema>, TargetClass> = true;
const requirementTypeMatches: Exactly<z.output<typeof requirementSchema>, Requirement> = true;
const analysisTypeMatches: Exactly<z.output<typeof analysisSchema>, AnalysisSettings> = true;
void [planTypeMatches, postTypeMatches, targetTypeMatches, requirementTypeMatches, analysisTypeMatches];
