/** The coverage raster and the gap layer for the selected layer, class and height. */
import { useEffect, useMemo } from "react";
import { GapLayer } from "../../map/gapLayer";
import { gapOutlineSource } from "../../map/gapOutlines";
import type L from "../../map/leaflet";
import { forwardTo, inverseFrom } from "../../map/pixelToGrid";
import { RasterLayer } from "../../map/rasterLayer";
import { useMapLayer } from "../../map/useLeafletMap";
import { shownView, useCoverage } from "../coverageState";
import { layerScale, scaleIndices, scaleIndicesInSlices } from "../layerPaint";
import { selectedSlice } from "../selection";
import { useSession } from "../session";

/**
 * Table indices of the rasters last drawn, per values array and scale: a release shows the shown
 * slice and then the whole run, whose slice is the same array, and switching back to a layer drawn
 * before needs no second pass over its cells on the main thread.
 */
const drawn = new WeakMap<object, { scaleKey: string; indices: Int16Array }>();
/**
 * Index arrays of drag previews, used in turn: each preview's values are new and drawn once, and the
 * map shows one paint at a time, so two arrays serve a whole drag (2 bytes a cell of new memory per
 * preview otherwise, 20 previews a second, which the page's collector then pays for).
 */
const previewIndexArrays: Int16Array<ArrayBuffer>[] = [];
let previewTurn = 0;
function previewIndices(n: number): Int16Array<ArrayBuffer> {
  const k = previewTurn++ % 2;
  let a = previewIndexArrays[k];
  if (a?.length !== n) {
    a = new Int16Array(n);
    previewIndexArrays[k] = a;
  }
  return a;
}

/** Rasters up to this many cells are turned into indices at once (about 10 ms); larger ones in slices. */
const AT_ONCE_CELLS = 1_500_000;

export function useCoverageLayers(map: L.Map | null): void {
  const coverage = useMemo(() => new RasterLayer({ pane: "picket-coverage" }), []);
  const gaps = useMemo(() => new GapLayer(), []);
  useMapLayer(map, coverage);
  useMapLayer(map, gaps);
  const view = useCoverage(shownView);
  const previewing = useCoverage((s) => s.preview !== null);
  const { layer, heightM, classId, singlePostId, showGaps } = useSession();
  const slice = selectedSlice(view, classId, heightM);
  const partial = view?.partial === true;
  const frame = view?.frame;
  const crs = frame?.crs;
  const forward = useMemo(() => (crs ? forwardTo(crs) : null), [crs]);
  const inverse = useMemo(() => (crs ? inverseFrom(crs) : null), [crs]);

  useEffect(() => {
    if (!view || !slice || !frame || !forward) {
      coverage.setPaint(null);
      return;
    }
    const maxOverlap = view.radarPostIds.length;
    const maxH = Math.max(...view.heightsM, 1) * 2;
    const scale = layerScale(layer, maxOverlap, maxH);
    let values: ArrayLike<number> = slice.combinedPd;
    if (layer === "overlap") values = slice.overlap;
    else if (layer === "lowest") values = view.lowestVisibleAglM;
    else if (layer === "single") {
      const k = Math.max(0, view.radarPostIds.indexOf(singlePostId ?? view.radarPostIds[0]));
      values = slice.perRadarPd[k] ?? new Float32Array(0);
    }
    if (values.length !== frame.width * frame.height) {
      // The chosen radar's arrays are on their way (a run was scheduled when the layer changed).
      coverage.setPaint(null);
      return;
    }
    const scaleKey = `${layer}|${maxOverlap}|${maxH}`;
    const paint = (indices: Int16Array) =>
      coverage.setPaint({ frame, forward, indices, table: scale.table, pattern: "fill" });
    const hit = drawn.get(values);
    if (hit?.scaleKey === scaleKey) {
      paint(hit.indices);
      return;
    }
    if (values.length <= AT_ONCE_CELLS) {
      if (previewing) {
        paint(scaleIndices(scale, values, previewIndices(values.length)));
        return;
      }
      const indices = scaleIndices(scale, values);
      drawn.set(values, { scaleKey, indices });
      paint(indices);
      return;
    }
    // A large raster: the map keeps what it shows until the new indices are ready.
    let cancelled = false;
    const raster = values;
    void scaleIndicesInSlices(scale, raster, () => cancelled).then((indices) => {
      if (indices === null || cancelled) return;
      drawn.set(raster, { scaleKey, indices });
      paint(indices);
    });
    return () => {
      cancelled = true;
    };
  }, [view, slice, frame, forward, layer, singlePostId, coverage, previewing]);

  useEffect(() => {
    if (!slice || !frame || !forward || !inverse || !showGaps) {
      gaps.setGaps(null, null, null, null);
      return;
    }
    // While dragging, and in the first step of a release, the hatching follows at once; outlines and
    // their areas come with the accurate run's next step.
    const outlines =
      previewing || partial
        ? null
        : slice.gapShapes
          ? { shapes: slice.gapShapes, toLonLat: inverse }
          : gapOutlineSource(slice.gap, frame, inverse);
    gaps.setGaps(frame, forward, slice.gap, outlines);
  }, [slice, frame, forward, inverse, showGaps, gaps, previewing, partial]);
}
