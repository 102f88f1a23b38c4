// @vitest-environment jsdom
/** Typed post coordinates: a move is one undo step, onto a roof it mounts the post there, and a field left untouched moves nothing. */
import { act } from "react";
import { createRoot } from "react-dom/client";
import { describe, expect, it } from "vitest";
import type { Plan } from "../../src/io/planSchema";
import { PostsPanel } from "../../src/ui/panels/PostsPanel";
import { addBuilding } from "../../src/ui/planEdits";
import { ROOF_MAST_M } from "../../src/ui/postMoves";
import { useSession } from "../../src/ui/session";
import { undo, usePlanStore } from "../../src/ui/store";
import { samplePlan } from "./samplePlan";
import { squareGeometry } from "./squareGeometry";

(globalThis as { IS_REACT_ACT_ENVIRONMENT?: boolean }).IS_REACT_ACT_ENVIRONMENT = true;

/** Types into a controlled input as a user does, then leaves it (Enter or blur). */
async function typeInto(input: HTMLInputElement, text: string, leave: "enter" | "blur" = "enter") {
  const setter = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value")?.set;
  await act(async () => {
    setter?.call(input, text);
    input.dispatchEvent(new Event("input", { bubbles: true }));
  });
  await act(async () => {
    if (leave === "enter") input.dispatchEvent(new KeyboardEvent("keydown", { key: "Enter", bubbles: true }));
    else input.dispatchEvent(new FocusEvent("focusout", { bubbles: true }));
  });
}

const post = () => (usePlanStore.getState().plan as Plan).posts[0];

describe("post coordinates typed in the form", () => {
  it("moves the post, mounts it on a roof it lands on, and leaves it alone when a field is only passed through", async () => {
    const plan = samplePlan();
    // A surveyed position with more digits than the form shows.
    plan.posts[0].position.latDeg += 1.234e-7;
    const { lonDeg, latDeg } = plan.posts[0].position;
    // A 15 m building 0.001° east of the post.
    const withRoof = addBuilding(plan, squareGeometry(lonDeg + 0.0009, latDeg - 0.0001, 0.0002), 15);
    usePlanStore.getState().load(withRoof);
    useSession.getState().set({ selectedPostId: withRoof.posts[0].id });
    const host = document.createElement("div");
    document.body.append(host);
    const root = createRoot(host);
    await act(async () => root.render(<PostsPanel />));
    const lat = host.querySelector('[data-testid="post-lat"]') as HTMLInputElement;
    const lon = host.querySelector('[data-testid="post-lon"]') as HTMLInputElement;
    expect(lat.value).toBe(latDeg.toFixed(6));
    // Focus passing through a rounded field changes nothing.
    await typeInto(lat, lat.value, "blur");
    expect(usePlanStore.temporal.getState().pastStates).toHaveLength(0);
    // Out of range: named, nothing moved.
    await typeInto(lat, "91");
    expect(host.textContent).toMatch(/Latitude \(WGS 84, north positive\): 91 ° is above 84 °/);
    expect(post().position.latDeg).toBe(latDeg);
    // Onto the roof: mounted there, on a mast above it, one undo step.
    await typeInto(lon, (lonDeg + 0.001).toFixed(6));
    expect(post().position.lonDeg).toBeCloseTo(lonDeg + 0.001, 9);
    expect(post().position.latDeg).toBe(latDeg);
    expect(post().mounting).toBe("roof");
    expect(post().mastHeightM).toBe(15 + ROOF_MAST_M);
    expect(usePlanStore.temporal.getState().pastStates).toHaveLength(1);
    await act(async () => undo());
    expect(post().position.lonDeg).toBe(lonDeg);
    expect(post().mounting).toBe("ground");
    await act(async () => root.unmount());
  });
});
