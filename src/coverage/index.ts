/**
 * The public model API of Picket: every concept of src/coverage, gathered. Import from here outside
 * src/coverage (the app, workers, CLI, report); inside it, import the concept's own file.
 * Internal sweep kernels (maskAccurate, maskFast) are reached through terrainMask.
 */
export * from "./antennaGain.ts";
export * from "./antennaPattern.ts";
export * from "./atmosphere.ts";
export * from "./constants.ts";
export * from "./coverage.ts";
export * from "./detection.ts";
export * from "./detectionApprox.ts";
export * from "./evaluate.ts";
export * from "./fresnelIntegrals.ts";
export * from "./fusion.ts";
export * from "./grid.ts";
export * from "./linkBudget.ts";
export * from "./marcumQ.ts";
export * from "./metrics.ts";
export * from "./pdDbTable.ts";
export * from "./pdTable.ts";
export * from "./propagation.ts";
// wavelengthM is defined in propagation.ts; waveform.ts re-exports it, so it is published once here.
export { wavelengthM } from "./propagation.ts";
export * from "./radarCache.ts";
export * from "./radarEquation.ts";
export * from "./radarModel.ts";
export * from "./rain.ts";
export * from "./rayMarch.ts";
export * from "./regionMask.ts";
export * from "./rfExposure.ts";
export * from "./surfaces.ts";
export * from "./terrainMask.ts";
export * from "./units.ts";
export * from "./waveform.ts";
