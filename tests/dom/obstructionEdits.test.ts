// @vitest-environment jsdom
import { beforeEach, describe, expect, it } from "vitest";
import { DEFAULT_BUILDING_HEIGHT_M, DEFAULT_METRES_PER_LEVEL } from "../../src/coverage/constants";
import { roofHeightOf } from "../../src/io/buildingHeight";
import type { Plan } from "../../src/io/planSchema";
import { parsePlan } from "../../src/io/planValidation";
import {
  addBuilding,
  addTreeStand,
  removeBuilding,
  removeTreeStand,
  setBuildingHeight,
  setCanopyHeight,
} from "../../src/ui/planEdits";
import { obstructionUnder } from "../../src/ui/roofs";
import { undo, usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";
import { squareGeometry } from "./squareGeometry";

/** The sample plan with two buildings (the second by levels) and a tree stand beside them. */
function withObstructions(): Plan {
  let p = samplePlan();
  p = addBuilding(p, squareGeometry(15.3, 47.1, 0.0002), 12);
  p = addBuilding(p, squareGeometry(15.301, 47.1, 0.0002), 9);
  p.terrain.buildings.features[1].properties = { "building:levels": 4 };
  return addTreeStand(p, squareGeometry(15.302, 47.1, 0.0005), 18);
}

describe("buildings and tree stands chosen on the map", () => {
  beforeEach(() => usePlanStore.getState().load(withObstructions()));

  it("finds the building under a point before the trees, and says where a roof height comes from", () => {
    const p = withObstructions();
    expect(obstructionUnder(p, 15.3001, 47.1001)).toEqual({ kind: "building", index: 0 });
    expect(obstructionUnder(p, 15.3011, 47.1001)).toEqual({ kind: "building", index: 1 });
    expect(obstructionUnder(p, 15.3022, 47.1002)).toEqual({ kind: "tree", id: p.terrain.treeStands[0].id });
    expect(obstructionUnder(p, 15.31, 47.11)).toBeNull();
    expect(roofHeightOf(p.terrain.buildings.features[0].properties)).toEqual({
      heightM: 12,
      source: "height",
    });
    expect(roofHeightOf({ "building:levels": 4 })).toEqual({
      heightM: 4 * DEFAULT_METRES_PER_LEVEL,
      source: "levels",
    });
    expect(roofHeightOf({})).toEqual({ heightM: DEFAULT_BUILDING_HEIGHT_M, source: "default" });
    // An imported height keeps where it came from; a height typed in is given.
    expect(roofHeightOf({ height: 9, heightSource: "levels" })).toEqual({ heightM: 9, source: "levels" });
    const imported = withObstructions();
    imported.terrain.buildings.features[0].properties = { height: 6, heightSource: "default" };
    const typed = setBuildingHeight(imported, 0, 6);
    expect(typed).not.toBe(imported);
    expect(roofHeightOf(typed.terrain.buildings.features[0].properties)).toEqual({
      heightM: 6,
      source: "height",
    });
  });

  it("changes heights and deletes, each one undo step, and the plan stays valid", () => {
    const s = usePlanStore.getState();
    const treeId = withObstructions().terrain.treeStands[0].id;
    s.change((p) => setBuildingHeight(p, 1, 21.5), "building height");
    let plan = usePlanStore.getState().plan as Plan;
    // A height set here takes precedence over the levels, which stay in the feature.
    expect(plan.terrain.buildings.features[1].properties).toEqual({ "building:levels": 4, height: 21.5 });
    s.change((p) => setCanopyHeight(p, treeId, 25), "canopy height");
    s.change((p) => removeBuilding(p, 0), "delete building");
    s.change((p) => removeTreeStand(p, treeId), "delete tree stand");
    plan = usePlanStore.getState().plan as Plan;
    expect(plan.terrain.buildings.features.map((f) => f.properties.height)).toEqual([21.5]);
    expect(plan.terrain.treeStands).toEqual([]);
    const r = parsePlan(JSON.parse(JSON.stringify(plan)));
    expect(r.ok ? [] : r.errors).toEqual([]);
    expect(usePlanStore.temporal.getState().pastStates).toHaveLength(4);
    undo();
    undo();
    plan = usePlanStore.getState().plan as Plan;
    expect(plan.terrain.buildings.features).toHaveLength(2);
    expect(plan.terrain.treeStands[0].canopyHeightM).toBe(25);
  });

  it("returns the same plan for a change that changes nothing (no empty undo step)", () => {
    const p = withObstructions();
    expect(setBuildingHeight(p, 0, 12)).toBe(p);
    expect(setBuildingHeight(p, 7, 30)).toBe(p);
    expect(removeBuilding(p, 7)).toBe(p);
    expect(setCanopyHeight(p, p.terrain.treeStands[0].id, 18)).toBe(p);
    expect(setCanopyHeight(p, "no-such-stand", 18)).toBe(p);
    expect(removeTreeStand(p, "no-such-stand")).toBe(p);
  });
});
