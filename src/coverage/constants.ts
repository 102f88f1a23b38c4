/**
 * Physical constants and model defaults, one value each, with its source.
 * No other file in the project writes these numbers.
 */

/** Speed of light in vacuum, m/s. Exact by definition of the metre (SI Brochure, 9th ed., 2019). */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;

/** Boltzmann constant, J/K. Exact since the 2019 SI redefinition (SI Brochure, 9th ed.). */
export const BOLTZMANN_J_PER_K = 1.380649e-23;

/** Standard reference noise temperature T0, K. IEEE Std 145 / IRE noise-figure definition (common practice). */
export const REFERENCE_TEMPERATURE_K = 290;

/**
 * Mean Earth radius, m. ITU-R P.834 / P.452 use 6371 km for the actual Earth radius
 * (effective radius a_e = k · 6371 km, ITU-R P.452-17 eq. 6a).
 */
export const EARTH_RADIUS_M = 6_371_000;

/** Default effective-Earth-radius factor k for radio paths in a standard atmosphere (ITU-R P.453; common practice 4/3). */
export const DEFAULT_EFFECTIVE_EARTH_FACTOR = 4 / 3;

/**
 * Range of k a plan or a command accepts. Below about 0.5 (strong sub-refraction, rare) the
 * effective Earth is too small for the model's flat-ground approximations; above 1000 the Earth is
 * flat to within millimetres over a site, so larger values only hide typing errors.
 */
export const MIN_EFFECTIVE_EARTH_FACTOR = 0.5;
export const MAX_EFFECTIVE_EARTH_FACTOR = 1000;

/**
 * Elevations a DEM sample may hold, m. Earth's surface spans about −10 935 m (Challenger Deep) to
 * 8 849 m (Everest) (from memory); a sample outside −11 000…9 000 m, or ±∞, is a damaged file or a
 * wrong sample format, and is read as nodata.
 */
export const MIN_ELEVATION_M = -11_000;
export const MAX_ELEVATION_M = 9_000;

/** Metres per building level when only `building:levels` is known (common practice, from memory: 3 m). */
export const DEFAULT_METRES_PER_LEVEL = 3;

/** Height given to a building footprint with no height tag at all, m (common practice for low-rise: two levels). */
export const DEFAULT_BUILDING_HEIGHT_M = 6;

/** One international foot, m. Exact by definition (International Yard and Pound Agreement, 1959). */
export const FOOT_M = 0.3048;

/** One US survey foot, m: 1200/3937 exactly (NIST Handbook 44, App. C; EPSG unit 9003). */
export const US_SURVEY_FOOT_M = 1200 / 3937;

/**
 * Canopy height given to a tree stand with no height attribute, m.
 * Typical mature temperate forest stands are 15–30 m tall (from memory); the low end is used.
 */
export const DEFAULT_CANOPY_HEIGHT_M = 15;

/**
 * Tallest obstruction height accepted from a footprint attribute, m. The tallest building stands
 * at 828 m (common knowledge); anything above 1000 m is taken as a unit or typing error.
 */
export const MAX_OBSTRUCTION_HEIGHT_M = 1000;

/**
 * Largest raster side (columns or rows) accepted from a DEM file header: 2^17 = 131 072.
 * A 1″ DEM of 36° × 36° fits; a header beyond it is refused before anything is allocated (project limit).
 */
export const MAX_DEM_HEADER_SIDE_CELLS = 131_072;

/**
 * Largest DEM window read into memory, cells: 2^25 = 33 554 432 (128 MiB as Float32).
 * Only the part of a DEM that covers the site grid is read; a larger window is refused (project limit).
 */
export const MAX_DEM_WINDOW_CELLS = 33_554_432;

/** Largest decompressed entry accepted from a KMZ/zip archive, bytes: 256 MiB (project limit against zip bombs). */
export const MAX_ARCHIVE_ENTRY_BYTES = 268_435_456;

/** Standard sea-level total pressure, hPa (ITU-R P.835-6 reference standard atmosphere; ISO 2533:1975). */
export const STANDARD_PRESSURE_HPA = 1013.25;

/** Standard sea-level temperature, K, i.e. 15 °C (ITU-R P.835-6 reference standard atmosphere; ISO 2533:1975). */
export const STANDARD_TEMPERATURE_K = 288.15;

/** Standard sea-level water-vapour density, g/m³ (ITU-R P.835-6 §1; the conditions of ITU-R P.676 Figure 1). */
export const STANDARD_WATER_VAPOUR_DENSITY_G_PER_M3 = 7.5;

/**
 * Argument x at which the uniform-aperture pattern (sin x / x)² falls to one half (the −3.01 dB point):
 * the root of sin x / x = 1/√2, x = 1.39156 (Balanis, Antenna Theory, 3rd ed., uniform line source;
 * common practice). Value solved to double precision with scipy.optimize.brentq (scipy 1.10.1).
 */
export const SINC2_HALF_POWER_ARGUMENT = 1.3915573782515096;

/**
 * Practical gain rule of thumb from the two half-power beamwidths in degrees: G ≈ 26 000 / (θaz·θel),
 * which folds a typical aperture efficiency (≈ 0.63 of the lossless 41 253 / (θaz·θel)) into the constant
 * (common practice, from memory; e.g. Stutzman & Thiele, Antenna Theory and Design).
 */
export const PRACTICAL_BEAMWIDTH_GAIN_DEG2 = 26_000;

/**
 * Gain of a single rectangular microstrip patch element on a low-cost laminate, dBi (common practice:
 * 5–7 dBi; the low end is used). With DEFAULT_PATCH_FEED_LOSS_DB_PER_LEVEL it reproduces the trade
 * figures ≈ 10.6 dBi for a 2 × 2 and ≈ 16 dBi for a 4 × 4 array at 5.8 GHz.
 */
export const DEFAULT_PATCH_ELEMENT_GAIN_DBI = 5.2;

/**
 * Corporate-feed loss per level of power division (per doubling of the element count) of a microstrip
 * patch array, dB (common practice, from memory: a few tenths of a dB per level on low-cost laminate).
 */
export const DEFAULT_PATCH_FEED_LOSS_DB_PER_LEVEL = 0.3;

/**
 * Height tolerance of the masking tests, m: a target within 1 mm of the sight line over the dominant
 * obstruction counts as visible. Model choice: it absorbs the Float32 rounding of the stored horizon
 * slope and the grazing ties on exactly flat ground (DEM heights are never better than centimetres).
 */
export const VISIBILITY_TOLERANCE_M = 0.001;
