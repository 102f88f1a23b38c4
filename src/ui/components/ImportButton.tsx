/** "Import…": a file picker for DEMs, buildings, posts CSV, plans and bundles (several at once). */
import { useRef } from "react";
import { importFiles } from "../import/importFiles";

export function ImportButton() {
  const input = useRef<HTMLInputElement>(null);
  return (
    <>
      <button type="button" onClick={() => input.current?.click()} data-testid="import">
        Import…
      </button>
      <input
        ref={input}
        type="file"
        multiple
        hidden
        aria-label="Import files"
        data-testid="import-input"
        accept=".tif,.tiff,.hgt,.asc,.geojson,.json,.kml,.kmz,.osm,.csv,.txt,.zip"
        onChange={(e) => {
          const files = Array.from(e.target.files ?? []);
          e.target.value = "";
          void importFiles(files);
        }}
      />
    </>
  );
}
