/**
 * Command-line value parsing shared by the `calc` and `plan` commands. Every error names the flag,
 * so the user knows which value to fix.
 */
import { CommanderError } from "commander";
import type { MaskMode } from "../coverage/terrainMask.ts";

/** Parsed options of one subcommand, as commander gives them. */
export type Opts = Record<string, string | boolean | undefined>;

/** A bad command-line value; `flag` is the option as typed (e.g. "--pfa"). */
export class UsageError extends Error {
  override name = "UsageError";
  constructor(
    readonly flag: string,
    message: string,
  ) {
    super(`${flag}: ${message}`);
  }
}

/** A run that could not be done with valid flags (a plan that cannot be prepared, …): exit status 1. */
export class RunError extends Error {
  override name = "RunError";
}

/**
 * The exit status for an error a command threw, after printing it as `command: message`:
 * 2 for bad input (UsageError, or commander's own usage errors, which it has already printed),
 * 1 for a failed run, 0 for commander's --help/--version exits. Anything else is a bug: rethrown.
 */
export function exitStatus(command: string, e: unknown): number {
  if (e instanceof UsageError || e instanceof RunError) {
    process.stderr.write(`${command}: ${e.message}\n`);
    return e instanceof UsageError ? 2 : 1;
  }
  if (e instanceof CommanderError) return e.exitCode === 0 ? 0 : 2;
  throw e;
}

export interface NumberRule {
  /** Smallest allowed value (inclusive unless `minExclusive`). */
  min?: number;
  minExclusive?: boolean;
  /** Largest allowed value (inclusive unless `maxExclusive`). */
  max?: number;
  maxExclusive?: boolean;
  integer?: boolean;
  /** Unit shown in messages, e.g. "m". */
  unit?: string;
}

/**
 * Parse a number given to `flag`. Accepts plain decimals, exponents (1e-6) and simple fractions (4/3).
 * Throws UsageError naming the flag when it is missing, not a finite number, or out of range.
 */
export function parseNumber(flag: string, raw: unknown, rule: NumberRule = {}): number {
  if (raw === undefined || raw === null || raw === "") throw new UsageError(flag, "a value is required");
  const text = String(raw).trim();
  const fraction = /^([-+]?[\d.]+(?:e[-+]?\d+)?)\/([\d.]+(?:e[-+]?\d+)?)$/i.exec(text);
  const value = fraction ? Number(fraction[1]) / Number(fraction[2]) : Number(text);
  const unit = rule.unit ? (rule.unit === "°" ? "°" : ` ${rule.unit}`) : "";
  if (!Number.isFinite(value)) throw new UsageError(flag, `"${text}" is not a finite number`);
  if (rule.integer && !Number.isInteger(value)) throw new UsageError(flag, `${text} must be a whole number`);
  if (rule.min !== undefined && (rule.minExclusive ? value <= rule.min : value < rule.min)) {
    throw new UsageError(flag, `${text}${unit} must be ${rule.minExclusive ? ">" : "≥"} ${rule.min}${unit}`);
  }
  if (rule.max !== undefined && (rule.maxExclusive ? value >= rule.max : value > rule.max)) {
    throw new UsageError(flag, `${text}${unit} must be ${rule.maxExclusive ? "<" : "≤"} ${rule.max}${unit}`);
  }
  return value;
}

/** Parse "LAT,LON" in decimal degrees; names the flag on error. */
export function parseLatLon(flag: string, raw: unknown): { lat: number; lon: number } {
  const parts = String(raw ?? "").split(",");
  if (parts.length !== 2)
    throw new UsageError(flag, `expected LAT,LON in decimal degrees, got "${raw ?? ""}"`);
  const lat = parseNumber(flag, parts[0], { unit: "°" });
  const lon = parseNumber(flag, parts[1], { unit: "°" });
  if (Math.abs(lat) > 90) {
    const hint = Math.abs(lon) <= 90 ? " (the order is LAT,LON: are the two swapped?)" : "";
    throw new UsageError(flag, `latitude ${lat}° must lie within ±90°${hint}`);
  }
  if (Math.abs(lon) > 180) throw new UsageError(flag, `longitude ${lon}° must lie within ±180°`);
  return { lat, lon };
}

/** `--mode`: the masking mode, or `fallback` when the flag is not given. */
export function parseMaskMode(raw: unknown, fallback: MaskMode): MaskMode {
  if (raw === undefined) return fallback;
  if (raw === "accurate" || raw === "fast") return raw;
  throw new UsageError("--mode", `"${String(raw)}" must be accurate or fast`);
}
