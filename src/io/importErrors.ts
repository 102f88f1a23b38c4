/**
 * The one error raised by every terrain and surface importer (DEM, buildings, tree stands).
 * Recognised by its stable `name` ("ImportError"), which survives a worker boundary where the
 * class itself does not. The message always starts with the file name, then the field if one is at fault.
 */
export class ImportError extends Error {
  override readonly name = "ImportError";
  /** The file that could not be imported, as the user named it. */
  readonly file: string;
  /** The header key, tag, property or feature path at fault, if any (e.g. "ncols", "features[3].properties.height"). */
  readonly field: string | undefined;

  constructor(file: string, message: string, field?: string) {
    super(field === undefined ? `${file}: ${message}` : `${file}: ${field}: ${message}`);
    this.file = file;
    this.field = field;
  }
}

/** What a thrown value says, for a message (some libraries throw values, or errors without a message). */
export function errorText(e: unknown): string {
  return e instanceof Error && e.message !== "" ? e.message : String(e);
}

/** True for an ImportError, also one that crossed a worker boundary as a plain { name, message }. */
export function isImportError(e: unknown): e is { name: "ImportError"; message: string } {
  return typeof e === "object" && e !== null && (e as { name?: unknown }).name === "ImportError";
}
