/**
 * The optional tile server: off by default (the app then makes no network request beyond its own
 * files). Stored in localStorage; the Content-Security-Policy is narrowed to its origin at start-up, so
 * choosing a server of another origin reloads the page (the plan is saved first).
 */
import { create } from "zustand";

export interface TileServer {
  /** e.g. https://tiles.example.org/{z}/{x}/{y}.png */
  urlTemplate: string;
  attribution: string;
}

const KEY = "picket.tileServer";

function load(): TileServer | null {
  try {
    const v = JSON.parse(localStorage.getItem(KEY) ?? "null");
    return v && typeof v.urlTemplate === "string" && typeof v.attribution === "string" ? v : null;
  } catch {
    return null;
  }
}

/** Checks a tile URL template: https (or http on this machine) with {z}, {x} and {y}. */
export function checkTileTemplate(url: string): string | null {
  let u: URL;
  try {
    u = new URL(url.replace(/\{[a-z]\}/g, "0"));
  } catch {
    return `"${url}" is not a URL`;
  }
  const local = u.hostname === "127.0.0.1" || u.hostname === "localhost";
  if (u.protocol !== "https:" && !(u.protocol === "http:" && local)) return "the tile server must use https";
  for (const k of ["{z}", "{x}", "{y}"]) if (!url.includes(k)) return `the template needs ${k}`;
  return null;
}

export interface BasemapState {
  server: TileServer | null;
  setServer: (s: TileServer | null) => void;
}

export const useBasemap = create<BasemapState>()((set) => ({
  server: typeof localStorage === "undefined" ? null : load(),
  setServer: (server) => {
    try {
      if (server) localStorage.setItem(KEY, JSON.stringify(server));
      else localStorage.removeItem(KEY);
    } catch {
      // storage blocked: the setting lasts for this page only
    }
    set({ server });
  },
}));

/** The origin images may come from besides this one, for the narrowed CSP (null: none). */
export function tileOrigin(server: TileServer | null): string | null {
  if (!server) return null;
  try {
    return new URL(server.urlTemplate.replace(/\{[a-z]\}/g, "0")).origin;
  } catch {
    return null;
  }
}

/**
 * The tile origin the page's image policy was narrowed to at start-up (undefined before). A policy
 * set by a meta tag can only be narrowed further, never widened, so a new origin needs a reload.
 */
let policyOrigin: string | null | undefined;

export function notePolicyOrigin(origin: string | null): void {
  policyOrigin = origin;
}

/** True when `server`'s tiles would be blocked by the policy of this page (a reload lifts that). */
export function needsReloadFor(server: TileServer | null): boolean {
  const origin = tileOrigin(server);
  return policyOrigin !== undefined && origin !== null && origin !== policyOrigin;
}
