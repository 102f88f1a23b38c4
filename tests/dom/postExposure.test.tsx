// @vitest-environment jsdom
/** The post form's RF-exposure figures: the model's stopped-antenna distances, and a warning when the public one exceeds the antenna height. */
import { act } from "react";
import { createRoot } from "react-dom/client";
import { describe, expect, it } from "vitest";
import { radarExposure } from "../../src/coverage/rfExposure";
import type { Plan } from "../../src/io/planSchema";
import { PostsPanel } from "../../src/ui/panels/PostsPanel";
import { updatePost } from "../../src/ui/planEdits";
import { useSession } from "../../src/ui/session";
import { usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

describe("post RF exposure", () => {
  it("lists the stopped-antenna distances of the post's radar and warns when the public one is above the antenna height", async () => {
    const plan = samplePlan();
    const post = plan.posts[0];
    usePlanStore.getState().load(plan);
    useSession.getState().set({ selectedPostId: post.id });
    const host = document.createElement("div");
    document.body.append(host);
    const root = createRoot(host);
    await act(async () => root.render(<PostsPanel />));
    const model = (usePlanStore.getState().plan as Plan).radarModels[0];
    const stopped = radarExposure(model).stopped.filter((r) => Number.isFinite(r.distanceM));
    const cells = Array.from(
      host.querySelectorAll('[data-testid="post-exposure"] td'),
      (td) => td.textContent,
    );
    expect(cells).toEqual(stopped.map((r) => `${r.distanceM.toFixed(2)} m`));
    const publicM = Math.max(
      ...stopped.filter((r) => r.population === "general public").map((r) => r.distanceM),
    );
    // The example pulsed radar: metres, not centimetres (1 kW peak, 30 dBi, 1 % duty).
    expect(publicM).toBeGreaterThan(1);
    const warned = () => host.querySelector('[data-testid="exposure-warning"]') !== null;
    const withMast = async (m: number) =>
      act(async () => usePlanStore.getState().change((p) => updatePost(p, post.id, { mastHeightM: m })));
    await withMast(Math.ceil(publicM) + 1);
    expect(warned()).toBe(false);
    await withMast(Math.floor(publicM) - 0.5);
    expect(warned()).toBe(true);
    expect(host.textContent).toMatch(/people on the ground or on nearby roofs may be in the beam/);
    await act(async () => root.unmount());
  });
});
