/**
 * The posts on the map. Dragging shows a fast preview of the coverage (drag preview in the session,
 * throttled to one run in flight); releasing commits the move to the plan (one undo step) and snaps a
 * post dropped on a building to its roof, offering the roof height as the mounting height.
 */
import { useEffect, useMemo, useRef } from "react";
import { radarExposure } from "../../coverage/rfExposure";
import type { Plan, Post } from "../../io/planSchema";
import { radarModelOfPost } from "../../io/planValidation";
import type L from "../../map/leaflet";
import { PostsLayer, type PostView } from "../../map/postsLayer";
import { useMapLayer } from "../../map/useLeafletMap";
import { computeReleaseAhead, evaluateScheduledNow, runEvaluation } from "../engine";
import { tenthOfDegree } from "../numberText";
import { updatePost } from "../planEdits";
import { movedPost, movePostTo } from "../postMoves";
import { planTabPatch, useSession } from "../session";
import { usePlanStore } from "../store";

function postViews(
  plan: Plan,
  preview: { postId: string; lonDeg: number; latDeg: number; azDeg?: number } | null,
): PostView[] {
  return plan.posts.map((p) => {
    const model = radarModelOfPost(plan, p);
    const scan = model?.scan;
    const width =
      p.scanSector?.widthDeg ??
      (scan?.kind === "sector" ? scan.sectorWidthDeg : scan?.kind === "staring" ? scan.fovAzDeg : 360);
    const dragged = preview?.postId === p.id ? preview : null;
    const boresight = dragged?.azDeg ?? p.boresightAzDeg;
    let exposure = Number.NaN;
    if (model) {
      const e = radarExposure(model);
      exposure =
        e.stopped.find((r) => r.standard === "ICNIRP 2020" && r.population === "general public")?.distanceM ??
        Number.NaN;
    }
    return {
      id: p.id,
      name: p.name,
      lonDeg: dragged ? dragged.lonDeg : p.position.lonDeg,
      latDeg: dragged ? dragged.latDeg : p.position.latDeg,
      boresightAzDeg: boresight,
      enabled: p.enabled,
      sectorWidthDeg: width,
      sectorCentreAzDeg: p.scanSector?.centreAzDeg ?? boresight,
      maxRangeM: model?.maxInstrumentedRangeM ?? 0,
      exposureDistanceM: exposure,
    };
  });
}

/** A post with a temporary position or boresight, for the preview run. */
function withPreview(plan: Plan, id: string, patch: Partial<Post>): Plan {
  return updatePost(plan, id, patch);
}

export function usePostsLayer(map: L.Map | null): void {
  const previewRef = useRef<{ postId: string; lonDeg: number; latDeg: number; azDeg?: number } | null>(null);
  const inFlight = useRef(false);
  const queued = useRef<Plan | null>(null);

  const preview = useMemo(() => {
    const runPreview = async (plan: Plan) => {
      if (inFlight.current) {
        queued.current = plan;
        return;
      }
      inFlight.current = true;
      // The preview runs on a temporary plan; the plan store (and its history) is not touched.
      await runEvaluation({ preview: true, plan });
      inFlight.current = false;
      const next = queued.current;
      queued.current = null;
      if (next && previewRef.current) void runPreview(next);
    };
    return runPreview;
  }, []);

  const layer = useMemo(
    () =>
      new PostsLayer({
        onSelect: (id) => {
          // The post's form is under Posts: bring that tab forward.
          useSession.getState().set({ selectedPostId: id, ...planTabPatch("posts") });
        },
        onDrag: (id, lonDeg, latDeg) => {
          previewRef.current = { postId: id, lonDeg, latDeg };
          const plan = usePlanStore.getState().plan;
          if (!plan) return;
          void preview(withPreview(plan, id, { position: { lonDeg, latDeg } }));
          // Should the pointer rest here, the release is computed ahead with the plan a drop makes.
          computeReleaseAhead(() => movedPost(plan, id, lonDeg, latDeg)?.plan ?? null);
        },
        onDragEnd: (id, lonDeg, latDeg) => {
          previewRef.current = null;
          movePostTo(id, lonDeg, latDeg);
          evaluateScheduledNow();
        },
        onBoresight: (id, azDeg, done) => {
          const plan = usePlanStore.getState().plan;
          if (!plan) return;
          const az = tenthOfDegree(azDeg);
          if (done) {
            previewRef.current = null;
            usePlanStore.getState().change((p) => updatePost(p, id, { boresightAzDeg: az }), "turn post");
            evaluateScheduledNow();
          } else {
            const post = plan.posts.find((p) => p.id === id);
            if (!post) return;
            previewRef.current = {
              postId: id,
              lonDeg: post.position.lonDeg,
              latDeg: post.position.latDeg,
              azDeg: az,
            };
            void preview(withPreview(plan, id, { boresightAzDeg: az }));
            // As for a move: held still, the turn's release is computed ahead.
            computeReleaseAhead(() => updatePost(plan, id, { boresightAzDeg: az }));
          }
        },
      }),
    [preview],
  );
  useMapLayer(map, layer);
  const plan = usePlanStore((s) => s.plan);
  const selected = useSession((s) => s.selectedPostId);
  const showSectors = useSession((s) => s.showSectors);
  const showExposure = useSession((s) => s.showExposure);
  useEffect(() => {
    if (plan) layer.setPosts(postViews(plan, previewRef.current), selected, { showSectors, showExposure });
  }, [plan, selected, showSectors, showExposure, layer]);
}
