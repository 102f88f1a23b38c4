/** A square GeoJSON polygon for tests: side `d` degrees, south-west corner at (lon, lat). */
import type { AreaGeometry } from "../../src/io/planSchema";

export function squareGeometry(lon: number, lat: number, d: number): AreaGeometry {
  return {
    type: "Polygon",
    coordinates: [
      [
        [lon, lat],
        [lon + d, lat],
        [lon + d, lat + d],
        [lon, lat + d],
        [lon, lat],
      ],
    ],
  };
}
