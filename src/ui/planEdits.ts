/**
 * Plan changes as pure functions (old plan → new plan), used by the panels and map tools. Each returns
 * the same object when nothing changes, so no empty undo step is recorded.
 */
import type { AreaGeometry, BuildingFeature, Plan, Post, TargetClass, TreeStand } from "../io/planSchema";
import { freshId } from "./store";

function withBuildings(plan: Plan, features: BuildingFeature[]): Plan {
  return { ...plan, terrain: { ...plan.terrain, buildings: { ...plan.terrain.buildings, features } } };
}

function withTreeStands(plan: Plan, treeStands: TreeStand[]): Plan {
  return { ...plan, terrain: { ...plan.terrain, treeStands } };
}

export function updatePost(plan: Plan, id: string, patch: Partial<Post>): Plan {
  let changed = false;
  const posts = plan.posts.map((p) => {
    if (p.id !== id) return p;
    const next = { ...p, ...patch };
    changed = (Object.keys(patch) as (keyof Post)[]).some((k) => p[k] !== next[k]);
    return next;
  });
  return changed ? { ...plan, posts } : plan;
}

export function removePost(plan: Plan, id: string): Plan {
  return { ...plan, posts: plan.posts.filter((p) => p.id !== id) };
}

/** A new post at a position, with the first radar model of the library and a 10 m mast. */
export function addPost(
  plan: Plan,
  lonDeg: number,
  latDeg: number,
  extra: Partial<Post> = {},
): { plan: Plan; id: string } {
  const id = freshId("post", plan.posts);
  const model = plan.radarModels[0];
  const post: Post = {
    id,
    name: `Post ${plan.posts.length + 1}`,
    position: { lonDeg, latDeg },
    mounting: "ground",
    mastHeightM: 10,
    ...(model ? { radarModelId: model.id } : {}),
    boresightAzDeg: 0,
    tiltDeg: 0,
    enabled: true,
    ...extra,
  };
  return { plan: { ...plan, posts: [...plan.posts, post] }, id };
}

export function addProtectedArea(plan: Plan, geometry: AreaGeometry): Plan {
  const id = freshId("area", plan.protectedAreas);
  return {
    ...plan,
    protectedAreas: [
      ...plan.protectedAreas,
      { id, name: `Area ${plan.protectedAreas.length + 1}`, geometry },
    ],
  };
}

export function removeProtectedArea(plan: Plan, id: string): Plan {
  if (plan.protectedAreas.length <= 1) return plan;
  return { ...plan, protectedAreas: plan.protectedAreas.filter((a) => a.id !== id) };
}

export function replaceAreaGeometry(plan: Plan, id: string, geometry: AreaGeometry): Plan {
  return { ...plan, protectedAreas: plan.protectedAreas.map((a) => (a.id === id ? { ...a, geometry } : a)) };
}

export function addBuilding(plan: Plan, geometry: AreaGeometry, heightM: number): Plan {
  const ids = plan.terrain.buildings.features.map((f, i) => ({ id: String(f.id ?? `b${i}`) }));
  const f: BuildingFeature = {
    type: "Feature",
    id: freshId("building", ids),
    geometry,
    properties: { height: heightM },
  };
  return withBuildings(plan, [...plan.terrain.buildings.features, f]);
}

export function addBuildings(plan: Plan, features: BuildingFeature[]): Plan {
  return withBuildings(plan, [...plan.terrain.buildings.features, ...features]);
}

export function addTreeStand(plan: Plan, geometry: AreaGeometry, canopyHeightM: number): Plan {
  const t: TreeStand = {
    id: freshId("trees", plan.terrain.treeStands),
    name: `Trees ${plan.terrain.treeStands.length + 1}`,
    geometry,
    canopyHeightM,
  };
  return withTreeStands(plan, [...plan.terrain.treeStands, t]);
}

/** Removes a target class; the last one stays (a plan judges at least one). */
export function removeTargetClass(plan: Plan, id: string): Plan {
  if (plan.targetClasses.length <= 1 || !plan.targetClasses.some((t) => t.id === id)) return plan;
  return { ...plan, targetClasses: plan.targetClasses.filter((t) => t.id !== id) };
}

export function updateTargetClass(plan: Plan, id: string, patch: Partial<TargetClass>): Plan {
  return { ...plan, targetClasses: plan.targetClasses.map((t) => (t.id === id ? { ...t, ...patch } : t)) };
}

/** Heights as a plan keeps them: ascending, without repeats. */
export function heightSet(heightsM: readonly number[]): number[] {
  return [...new Set(heightsM)].sort((a, b) => a - b);
}

/** Sets the analysis heights and keeps every class's heights inside them. */
export function setAnalysisHeights(plan: Plan, heightsM: number[]): Plan {
  const hs = heightSet(heightsM);
  const targetClasses = plan.targetClasses.map((t) => {
    const kept = t.heightsAglM.filter((h) => hs.includes(h));
    return { ...t, heightsAglM: kept.length > 0 ? kept : hs };
  });
  return { ...plan, analysis: { ...plan.analysis, targetHeightsM: hs }, targetClasses };
}

/** Sets a building's roof height above ground (its `height`, which takes precedence over levels). */
export function setBuildingHeight(plan: Plan, index: number, heightM: number): Plan {
  const f = plan.terrain.buildings.features[index];
  if (!f || (f.properties.height === heightM && f.properties.heightSource === undefined)) return plan;
  const features = plan.terrain.buildings.features.slice();
  // A height the user sets is given, no longer made from levels or the default.
  const { heightSource: _made, ...given } = f.properties;
  features[index] = { ...f, properties: { ...given, height: heightM } };
  return withBuildings(plan, features);
}

export function removeBuilding(plan: Plan, index: number): Plan {
  if (!plan.terrain.buildings.features[index]) return plan;
  return withBuildings(
    plan,
    plan.terrain.buildings.features.filter((_, i) => i !== index),
  );
}

export function setCanopyHeight(plan: Plan, id: string, canopyHeightM: number): Plan {
  const t = plan.terrain.treeStands.find((s) => s.id === id);
  if (!t || t.canopyHeightM === canopyHeightM) return plan;
  return withTreeStands(
    plan,
    plan.terrain.treeStands.map((s) => (s.id === id ? { ...s, canopyHeightM } : s)),
  );
}

export function removeTreeStand(plan: Plan, id: string): Plan {
  if (!plan.terrain.treeStands.some((s) => s.id === id)) return plan;
  return withTreeStands(
    plan,
    plan.terrain.treeStands.filter((s) => s.id !== id),
  );
}
