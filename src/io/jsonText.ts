/**
 * Reading JSON text with syntax errors located by line and column (1-based), because the
 * message of the built-in parser differs between engines and often names no position.
 * The value comes from JSON.parse; a small scanner (RFC 8259 grammar) only locates the error.
 */

export interface JsonSyntaxError {
  /** 1-based line of the offending character. */
  line: number;
  /** 1-based column of the offending character. */
  column: number;
  message: string;
}

export type JsonTextResult = { ok: true; value: unknown } | { ok: false; error: JsonSyntaxError };

/** Parse JSON text. Never throws. A leading byte-order mark is ignored. */
export function parseJsonText(text: string): JsonTextResult {
  if (typeof text !== "string") {
    return { ok: false, error: { line: 1, column: 1, message: "the file is not text" } };
  }
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  try {
    return { ok: true, value: JSON.parse(body) };
  } catch (err) {
    const located = locateJsonError(body);
    if (located) return { ok: false, error: located };
    return { ok: false, error: { line: 1, column: 1, message: `not valid JSON (${String(err)})` } };
  }
}

/** The error as `line L, column C: message`. */
export function formatJsonSyntaxError(e: JsonSyntaxError): string {
  return `line ${e.line}, column ${e.column}: ${e.message}`;
}

class Located extends Error {
  constructor(
    readonly index: number,
    message: string,
  ) {
    super(message);
  }
}

/** Position of the first syntax error in `s`, or null when the scanner finds none. */
export function locateJsonError(s: string): JsonSyntaxError | null {
  let i = 0;
  const n = s.length;
  const fail = (message: string): never => {
    throw new Located(i, message);
  };
  const what = (): string => (i >= n ? "end of the file" : `${JSON.stringify(s[i])}`);
  const ws = () => {
    while (i < n && (s[i] === " " || s[i] === "\t" || s[i] === "\n" || s[i] === "\r")) i++;
  };
  const literal = (word: string) => {
    for (let k = 0; k < word.length; k++) {
      if (s[i] !== word[k]) fail(`unexpected ${what()} (expected ${word})`);
      i++;
    }
  };
  const string = () => {
    i++; // opening quote
    while (true) {
      if (i >= n) fail("unterminated string");
      const c = s.charCodeAt(i);
      if (c === 0x22) {
        i++;
        return;
      }
      if (c < 0x20) fail("control character inside a string (escape it)");
      if (c === 0x5c) {
        i++;
        const e = s[i];
        if (e === "u") {
          for (let k = 1; k <= 4; k++) {
            if (!/[0-9a-fA-F]/.test(s[i + k] ?? "")) {
              i += k;
              fail("bad \\u escape (needs 4 hex digits)");
            }
          }
          i += 5;
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i++;
        else fail(`bad escape \\${e ?? ""}`);
      } else i++;
    }
  };
  const digits = () => {
    const start = i;
    while (i < n && s[i] >= "0" && s[i] <= "9") i++;
    if (i === start) fail(`unexpected ${what()} in a number (expected a digit)`);
  };
  const number = () => {
    if (s[i] === "-") i++;
    if (s[i] === "0") i++;
    else digits();
    if (s[i] === ".") {
      i++;
      digits();
    }
    if (s[i] === "e" || s[i] === "E") {
      i++;
      if (s[i] === "+" || s[i] === "-") i++;
      digits();
    }
  };
  const value = (depth: number) => {
    if (depth > 10000) fail("nesting too deep");
    ws();
    const c = s[i];
    if (c === "{") {
      i++;
      ws();
      if (s[i] === "}") {
        i++;
        return;
      }
      while (true) {
        ws();
        if (s[i] !== '"') fail(`unexpected ${what()} (expected a quoted field name)`);
        string();
        ws();
        if (s[i] !== ":") fail(`unexpected ${what()} (expected ":")`);
        i++;
        value(depth + 1);
        ws();
        if (s[i] === ",") {
          i++;
          ws();
          if (s[i] === "}") fail('trailing comma before "}"');
          continue;
        }
        if (s[i] === "}") {
          i++;
          return;
        }
        fail(`unexpected ${what()} (expected "," or "}")`);
      }
    }
    if (c === "[") {
      i++;
      ws();
      if (s[i] === "]") {
        i++;
        return;
      }
      while (true) {
        value(depth + 1);
        ws();
        if (s[i] === ",") {
          i++;
          ws();
          if (s[i] === "]") fail('trailing comma before "]"');
          continue;
        }
        if (s[i] === "]") {
          i++;
          return;
        }
        fail(`unexpected ${what()} (expected "," or "]")`);
      }
    }
    if (c === '"') return string();
    if (c === "-" || (c !== undefined && c >= "0" && c <= "9")) return number();
    if (c === "t") return literal("true");
    if (c === "f") return literal("false");
    if (c === "n") return literal("null");
    fail(
      i >= n ? "unexpected end of the file (expected a value)" : `unexpected ${what()} (expected a value)`,
    );
  };
  try {
    value(0);
    ws();
    if (i < n) fail(`unexpected ${what()} after the end of the JSON value`);
    return null;
  } catch (err) {
    const index = err instanceof Located ? err.index : i;
    const message = err instanceof Located ? err.message : "not valid JSON";
    let line = 1;
    let lineStart = 0;
    for (let k = 0; k < index && k < n; k++) {
      if (s[k] === "\n") {
        line++;
        lineStart = k + 1;
      }
    }
    return { line, column: index - lineStart + 1, message };
  }
}
