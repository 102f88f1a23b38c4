/**
 * Unit conversions: the only place in the project that turns dB into linear values and
 * degrees into radians. Power ratios use 10·log10 (IEEE Std 100 definition of the decibel).
 * NaN in gives NaN out; 0 linear gives -Infinity dB.
 */

/** Decibels (power ratio) to a linear power ratio. */
export function dbToLinear(db: number): number {
  return 10 ** (db / 10);
}

/** Linear power ratio to decibels. 0 → -Infinity; negative → NaN. */
export function linearToDb(ratio: number): number {
  return 10 * Math.log10(ratio);
}

/** Field (amplitude) ratio to decibels: 20·log10 (IEEE Std 100). 0 → -Infinity; negative → NaN. */
export function fieldRatioToDb(ratio: number): number {
  return 20 * Math.log10(ratio);
}

/** Decibels to a field (amplitude) ratio: 10^(dB/20). */
export function dbToFieldRatio(db: number): number {
  return 10 ** (db / 20);
}

/** dBm (decibels relative to 1 mW) to watts. */
export function dbmToW(dbm: number): number {
  return 10 ** ((dbm - 30) / 10);
}

/** Watts to dBm. */
export function wToDbm(powerW: number): number {
  return 10 * Math.log10(powerW) + 30;
}

/** Watts to dBW. */
export function wToDbw(powerW: number): number {
  return 10 * Math.log10(powerW);
}

/** Radar cross-section in dBsm (dB relative to 1 m²) to m². */
export function dbsmToM2(dbsm: number): number {
  return 10 ** (dbsm / 10);
}

/** Radar cross-section in m² to dBsm. */
export function m2ToDbsm(rcsM2: number): number {
  return 10 * Math.log10(rcsM2);
}

const RAD_PER_DEG = Math.PI / 180;

/** Degrees to radians. */
export function degToRad(deg: number): number {
  return deg * RAD_PER_DEG;
}

/** Radians to degrees. */
export function radToDeg(rad: number): number {
  return rad / RAD_PER_DEG;
}

/** Wrap an angle in degrees to (-180, 180]. */
export function wrapDeg180(deg: number): number {
  let a = deg % 360;
  if (a <= -180) a += 360;
  else if (a > 180) a -= 360;
  // Rounding can leave exactly −180 after adding 360 to a value just above −540: report it as 180.
  return a <= -180 ? a + 360 : a;
}

/** Wrap an azimuth in degrees to [0, 360). */
export function wrapDeg360(deg: number): number {
  const a = deg % 360;
  if (a >= 0) return a;
  const b = a + 360;
  // A tiny negative angle rounds to exactly 360 in floating point: that is north, 0.
  return b >= 360 ? 0 : b;
}
