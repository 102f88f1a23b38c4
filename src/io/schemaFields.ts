/**
 * Field builders shared by the radar and plan schemas: numbers with a unit and a range, whose
 * error messages state the value and the rule (`5200 is above the 300 m limit`), and the
 * conversion of zod issues into `{ path, message }` records with paths like `posts[3].mastHeightM`.
 */
import { z } from "zod";

/** A value as it appears in an error message: numbers as written, NaN/Infinity by name, strings quoted. */
export function describeValue(value: unknown): string {
  if (typeof value === "number") return Number.isNaN(value) ? "NaN" : String(value);
  if (typeof value === "string") return JSON.stringify(value.length > 40 ? `${value.slice(0, 40)}…` : value);
  if (value === null) return "null";
  if (value === undefined) return "nothing";
  if (Array.isArray(value)) return "an array";
  return typeof value === "object" ? "an object" : typeof value;
}

/** A unit as it follows a number in a message: "" for dimensionless values, " m" otherwise. */
function unitSuffix(unit: string): string {
  return unit === "" ? "" : ` ${unit}`;
}

export interface QuantityRule {
  /** Unit symbol printed after numbers ("m", "W", "Hz", "dB", "deg"); "" for dimensionless. */
  unit: string;
  /** What the field is, with its unit, for the published JSON Schema. */
  description: string;
  /** Inclusive lower limit. */
  min?: number;
  /** Exclusive lower limit. */
  gt?: number;
  /** Inclusive upper limit. */
  max?: number;
  /** Exclusive upper limit. */
  lt?: number;
  /** Whole numbers only. */
  integer?: boolean;
}

/**
 * A finite number with a unit and a range. NaN, ±Infinity, strings and missing values are
 * rejected with a message that names the rule; the range appears in the JSON Schema.
 */
export function quantity(rule: QuantityRule) {
  const u = unitSuffix(rule.unit);
  let s = z.number({
    error: (iss) =>
      iss.input === undefined
        ? `is required (a number${u ? ` in${u}` : ""})`
        : `must be a finite number${u ? ` in${u}` : ""} (got ${describeValue(iss.input)})`,
  });
  if (rule.integer) {
    s = s.int({ error: (iss) => `must be a whole number (got ${describeValue(iss.input)})` });
  }
  if (rule.gt !== undefined) {
    const gt = rule.gt;
    s = s.gt(gt, { error: (iss) => `must be > ${gt}${u} (got ${describeValue(iss.input)})` });
  }
  if (rule.min !== undefined) {
    const min = rule.min;
    s = s.gte(min, { error: (iss) => `${describeValue(iss.input)} is below the ${min}${u} limit` });
  }
  if (rule.lt !== undefined) {
    const lt = rule.lt;
    s = s.lt(lt, { error: (iss) => `must be < ${lt}${u} (got ${describeValue(iss.input)})` });
  }
  if (rule.max !== undefined) {
    const max = rule.max;
    s = s.lte(max, { error: (iss) => `${describeValue(iss.input)} is above the ${max}${u} limit` });
  }
  return s.meta({ description: rule.description, ...(rule.unit ? { unit: rule.unit } : {}) });
}

/** A non-empty identifier (letters, digits, `-`, `_`, `.`), used for references between parts of a plan. */
export function identifier(description: string) {
  return z
    .string({
      error: (iss) =>
        iss.input === undefined
          ? "is required (an identifier)"
          : `must be a string (got ${describeValue(iss.input)})`,
    })
    .regex(/^[A-Za-z0-9][A-Za-z0-9_.-]{0,63}$/, {
      error: (iss) =>
        `${describeValue(iss.input)} is not a valid id (1–64 letters, digits, "-", "_" or ".", starting with a letter or digit)`,
    })
    .meta({ description });
}

/** Longest display name a plan holds, characters. */
export const MAX_NAME_CHARS = 200;

/** A display name: non-empty, at most MAX_NAME_CHARS characters. */
export function displayName(description: string) {
  return z
    .string({
      error: (iss) =>
        iss.input === undefined
          ? "is required (a name)"
          : `must be a string (got ${describeValue(iss.input)})`,
    })
    .min(1, { error: "must not be empty" })
    .max(MAX_NAME_CHARS, { error: `is longer than ${MAX_NAME_CHARS} characters` })
    .meta({ description });
}

/** One of a fixed set of words. */
export function oneOf<const T extends readonly [string, ...string[]]>(values: T, description: string) {
  return z
    .enum(values, {
      error: (iss) =>
        `${iss.input === undefined ? "is required" : `${describeValue(iss.input)} is not allowed`}; use one of ${values
          .map((v) => `"${v}"`)
          .join(", ")}`,
    })
    .meta({ description });
}

/** A strict object: unknown keys are errors (a misspelt field must not be silently dropped). */
export function record<T extends z.core.$ZodLooseShape>(shape: T, description: string) {
  return z
    .strictObject(shape, {
      error: (iss) =>
        iss.code === "unrecognized_keys"
          ? `unknown field${iss.keys.length > 1 ? "s" : ""} ${iss.keys.map((k) => `"${k}"`).join(", ")}`
          : iss.input === undefined
            ? "is required (an object)"
            : `must be an object (got ${describeValue(iss.input)})`,
    })
    .meta({ description });
}

/** One validation error: where (`posts[3].mastHeightM`) and which rule failed. */
export interface FieldError {
  path: string;
  message: string;
}

/** A zod path as `a.b[3].c`; the root is "(file)". */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = "";
  for (const key of path) {
    if (typeof key === "number") out += `[${key}]`;
    else {
      const k = String(key);
      out += /^[A-Za-z_$][A-Za-z0-9_$]*$/.test(k) ? (out === "" ? k : `.${k}`) : `[${JSON.stringify(k)}]`;
    }
  }
  return out === "" ? "(file)" : out;
}

/** An issue's message; a missing required field says so in our words rather than zod's default. */
function issueMessage(iss: z.core.$ZodIssue): string {
  if (iss.code === "invalid_type" && /received undefined$/.test(iss.message)) {
    return `is required (${iss.expected === "array" ? "a list" : `a ${iss.expected}`})`;
  }
  return iss.message;
}

/** The errors of a failed parse, one per issue, with `prefix` put in front of every path. */
export function issuesToErrors(
  issues: readonly z.core.$ZodIssue[],
  prefix: readonly PropertyKey[] = [],
): FieldError[] {
  const out: FieldError[] = [];
  for (const iss of issues) {
    if (iss.code === "unrecognized_keys") {
      // One error per unknown key, each at its own path.
      for (const key of iss.keys) {
        out.push({ path: formatPath([...prefix, ...iss.path, key]), message: "unknown field" });
      }
      continue;
    }
    if (iss.code === "invalid_union" && iss.errors.length > 0) {
      // Report the branch that got furthest (fewest issues), so the user sees the real problem.
      let best = iss.errors[0];
      for (const branch of iss.errors) if (branch.length < best.length) best = branch;
      out.push(...issuesToErrors(best, [...prefix, ...iss.path]));
      continue;
    }
    out.push({ path: formatPath([...prefix, ...iss.path]), message: issueMessage(iss) });
  }
  return out;
}

/** Errors as lines of text, `path: message`, for a terminal or an alert. */
export function formatErrors(errors: readonly FieldError[]): string {
  return errors.map((e) => `${e.path}: ${e.message}`).join("\n");
}
