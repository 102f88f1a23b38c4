/**
 * Files named on the command line. A path the user gave that cannot be read or written (missing, a
 * file where a folder should be, no permission, a full disk) becomes a UsageError naming the flag,
 * not a stack trace.
 */
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { UsageError } from "./args.ts";

function reason(e: unknown): string {
  const err = e as NodeJS.ErrnoException;
  switch (err.code) {
    case "ENOTDIR":
      return "a part of the path is a file, not a folder";
    case "EEXIST":
      return "a file of that name is in the way";
    case "EACCES":
    case "EPERM":
      return "permission denied";
    case "ENOSPC":
      return "the disk is full";
    case "EISDIR":
      return "it is a folder";
    case "ENOENT":
      return "no such file or folder";
    default:
      return err.message;
  }
}

/** The text of the file at `path`, named by `flag`. */
export function readTextFile(flag: string, path: string): string {
  try {
    return readFileSync(path, "utf8");
  } catch (e) {
    throw new UsageError(flag, `cannot read ${path}: ${reason(e)}`);
  }
}

/** The bytes of the file at `path`, named by `flag`. */
export function readBinaryFile(flag: string, path: string): ArrayBuffer {
  try {
    const b = readFileSync(path);
    // A large file has a buffer of its own (not Node's shared pool): taken as it is, not copied.
    if (b.byteOffset === 0 && b.buffer.byteLength === b.byteLength && b.buffer instanceof ArrayBuffer)
      return b.buffer;
    return b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;
  } catch (e) {
    throw new UsageError(flag, `cannot read ${path}: ${reason(e)}`);
  }
}

/** Create the folder `dir` (and its parents) for `flag`; returns `dir`. */
export function ensureOutputDir(flag: string, dir: string): string {
  try {
    mkdirSync(dir, { recursive: true });
  } catch (e) {
    throw new UsageError(flag, `cannot create the folder ${dir}: ${reason(e)}`);
  }
  return dir;
}

/** Write `data` to `path` for `flag`. */
export function writeOutputFile(flag: string, path: string, data: string | Uint8Array): void {
  try {
    writeFileSync(path, data);
  } catch (e) {
    throw new UsageError(flag, `cannot write ${path}: ${reason(e)}`);
  }
}
