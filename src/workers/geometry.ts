/** Bearing and distance between two points of the grid frame (grid north; for display only). */
import { radToDeg, wrapDeg360 } from "../coverage/units";

export function azimuthAndDistanceXY(
  x0: number,
  y0: number,
  x1: number,
  y1: number,
): { azDeg: number; distanceM: number } {
  return {
    azDeg: wrapDeg360(radToDeg(Math.atan2(x1 - x0, y1 - y0))),
    distanceM: Math.hypot(x1 - x0, y1 - y0),
  };
}
