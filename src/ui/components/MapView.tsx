/** The map: basemap, coverage, gaps, site, posts; drawing and click tools; files dropped on it are imported. */
import { useEffect, useRef, useState } from "react";
import { formatAreaM2 } from "../../map/gapOutlines";
import type L from "../../map/leaflet";
import { useLeafletMap } from "../../map/useLeafletMap";
import { useCoverage } from "../coverageState";
import { importFiles } from "../import/importFiles";
import { useBaseLayers } from "../mapHooks/useBaseLayers";
import { useCoverageLayers } from "../mapHooks/useCoverageLayers";
import { useDrawTools } from "../mapHooks/useDrawTools";
import { useFitToSite } from "../mapHooks/useFitToSite";
import { useInspectMarker } from "../mapHooks/useInspectMarker";
import { useMapClicks } from "../mapHooks/useMapClicks";
import { usePostsLayer } from "../mapHooks/usePostsLayer";
import { useSiteLayers } from "../mapHooks/useSiteLayers";
import { useSession } from "../session";

export function MapView(props: { onMap: (m: L.Map | null) => void; initialCentre: [number, number] }) {
  const ref = useRef<HTMLDivElement>(null);
  const map = useLeafletMap(ref, { centerLatLon: props.initialCentre, zoom: 15 });
  const onMap = props.onMap;
  useEffect(() => onMap(map), [map, onMap]);
  // The basemap follows the full-resolution results, not the (possibly coarser) drag preview.
  const view = useCoverage((s) => s.view);
  useBaseLayers(map, view);
  useCoverageLayers(map);
  useSiteLayers(map);
  usePostsLayer(map);
  useMapClicks(map);
  useFitToSite(map);
  useInspectMarker(map);
  const live = useDrawTools(map);
  const tool = useSession((s) => s.tool);
  const [dragOver, setDragOver] = useState(false);
  return (
    <section
      className={`map-wrap${dragOver ? " drag-over" : ""}`}
      aria-label="Site map"
      onDragOver={(e) => {
        e.preventDefault();
        setDragOver(true);
      }}
      onDragLeave={() => setDragOver(false)}
      onDrop={(e) => {
        e.preventDefault();
        setDragOver(false);
        void importFiles(Array.from(e.dataTransfer.files));
      }}
    >
      <div ref={ref} className="map" data-testid="map" />
      {live && live.vertices > 0 && (
        <div className="live-measure" role="status" data-testid="live-measure">
          {live.vertices} corners · outline{" "}
          {live.lengthM < 1000 ? `${live.lengthM.toFixed(0)} m` : `${(live.lengthM / 1000).toFixed(2)} km`} ·
          area {formatAreaM2(live.areaM2)}
        </div>
      )}
      {tool !== "select" && !live && (
        <div className="tool-banner" role="status">
          {tool === "post"
            ? "Click to place a post"
            : tool === "inspect"
              ? "Click a point to inspect it"
              : "Click the corners; click the first corner to finish"}{" "}
          · Esc to stop
        </div>
      )}
      {dragOver && <div className="drop-hint">Drop DEM, buildings, posts CSV or a plan to import</div>}
    </section>
  );
}
