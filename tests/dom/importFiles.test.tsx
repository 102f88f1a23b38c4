// @vitest-environment jsdom
/** Files through the import path the file picker and the map's drop share: posts and buildings. */
import { act } from "react";
import { createRoot } from "react-dom/client";
import { beforeEach, describe, expect, it } from "vitest";
import { DEFAULT_BUILDING_HEIGHT_M, DEFAULT_METRES_PER_LEVEL } from "../../src/coverage/constants";
import { roofHeightOf } from "../../src/io/buildingHeight";
import { MAX_RADARS_PER_RUN } from "../../src/io/siteGrid";
import { importFile } from "../../src/ui/import/importFiles";
import { ObstructionEditor } from "../../src/ui/panels/ObstructionEditor";
import { useSession } from "../../src/ui/session";
import { usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

/** A posts CSV of `n` rows on a grid of points 20 m apart beside the sample site. */
function postsCsv(n: number): File {
  const rows = ["name,lat,lon,mast_height_m"];
  for (let i = 0; i < n; i++)
    rows.push(`P${i},${47.1 + (i % 50) * 0.0002},${15.3 + Math.floor(i / 50) * 0.0002},10`);
  return new File([rows.join("\n")], "candidates.csv", { type: "text/csv" });
}

const lastMessage = () => useSession.getState().messages.at(-1);

describe("posts imported from CSV", () => {
  beforeEach(() => {
    usePlanStore.getState().load(samplePlan());
    useSession.setState({ messages: [] });
  });

  it("adds the rows as enabled posts in one undo step", async () => {
    const before = usePlanStore.getState().plan!.posts.length;
    await importFile(postsCsv(3));
    expect(usePlanStore.getState().plan!.posts.length).toBe(before + 3);
    expect(lastMessage()?.text).toBe("Imported 3 posts from candidates.csv.");
  });

  it("refuses a file that would give a run more posts than it takes, and leaves the plan as it was", async () => {
    const plan = usePlanStore.getState().plan!;
    const enabled = plan.posts.filter((p) => p.enabled).length;
    const n = MAX_RADARS_PER_RUN - enabled + 1;
    await importFile(postsCsv(n));
    expect(usePlanStore.getState().plan).toBe(plan);
    expect(lastMessage()?.kind).toBe("error");
    expect(lastMessage()?.text).toBe(
      `candidates.csv: ${n} posts would make ${MAX_RADARS_PER_RUN + 1} enabled posts; at most ${MAX_RADARS_PER_RUN} can take part in one run. Import the candidates in smaller files; the plan is unchanged.`,
    );
  });
});

/** A square footprint of about 20 m at (lon, lat) with the given properties, as GeoJSON. */
function footprint(lon: number, lat: number, properties: Record<string, unknown>) {
  const d = 0.0001;
  const ring = [
    [lon, lat],
    [lon + d, lat],
    [lon + d, lat + d],
    [lon, lat + d],
    [lon, lat],
  ];
  return { type: "Feature", properties, geometry: { type: "Polygon", coordinates: [ring] } };
}

describe("buildings imported from GeoJSON", () => {
  beforeEach(() => {
    usePlanStore.getState().load(samplePlan());
    useSession.setState({ messages: [] });
  });

  it("keeps each footprint's name as text and where its height came from", async () => {
    const name = '<img src=x onerror="alert(1)"> Pump hall';
    const text = JSON.stringify({
      type: "FeatureCollection",
      features: [
        footprint(15.3, 47.1, { name, height: 14 }),
        footprint(15.301, 47.1, { "building:levels": 3 }),
        footprint(15.302, 47.1, {}),
      ],
    });
    await importFile(new File([text], "yard.geojson", { type: "application/geo+json" }));
    const added = usePlanStore.getState().plan!.terrain.buildings.features.slice(-3);
    expect(added.map((f) => f.properties.name)).toEqual([name, undefined, undefined]);
    expect(added.map((f) => roofHeightOf(f.properties))).toEqual([
      { heightM: 14, source: "height" },
      { heightM: 3 * DEFAULT_METRES_PER_LEVEL, source: "levels" },
      { heightM: DEFAULT_BUILDING_HEIGHT_M, source: "default" },
    ]);
    expect(lastMessage()?.text).toBe("Imported 3 buildings and 0 tree stands from yard.geojson.");
  });
});

describe("the editor of an imported building", () => {
  it("titles it by its name as text and says its height came from its levels", async () => {
    usePlanStore.getState().load(samplePlan());
    const text = JSON.stringify({
      type: "FeatureCollection",
      features: [footprint(15.3, 47.1, { name: "<b>Annex</b>", "building:levels": 4 })],
    });
    await importFile(new File([text], "annex.geojson"));
    const index = usePlanStore.getState().plan!.terrain.buildings.features.length - 1;
    useSession.getState().set({ selectedObstruction: { kind: "building", index } });
    const host = document.createElement("div");
    document.body.append(host);
    const root = createRoot(host);
    await act(async () => root.render(<ObstructionEditor />));
    const editor = host.querySelector('[data-testid="obstruction-editor"]');
    expect(editor?.textContent).toMatch(/^<b>Annex<\/b>Roof height/);
    expect(editor?.textContent).toContain(`From 4 levels × ${DEFAULT_METRES_PER_LEVEL} m.`);
    expect(editor?.querySelector("b")).toBeNull();
    await act(async () => root.unmount());
  });
});
