/**
 * The Content-Security-Policy of the production build, set as a meta tag by a Vite plugin (build only:
 * the dev server needs inline scripts for hot reload). No inline script, no eval, connections to this
 * origin only. Images may come from any https origin at build time so that a tile server chosen later can
 * work; at start-up the app narrows img-src to the configured tile server (tileServerPolicy), and two
 * policies always intersect, so the effective policy is the narrower one.
 */
import type { Plugin } from "vite";

export const BUILD_CSP = [
  "default-src 'self'",
  "script-src 'self'",
  "worker-src 'self' blob:",
  "connect-src 'self'",
  // Tiles of a server chosen later: any https origin, or one on this machine (narrowed at start-up).
  "img-src 'self' data: blob: https: http://127.0.0.1:* http://localhost:*",
  "style-src 'self' 'unsafe-inline'",
  "font-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
].join("; ");

export function cspPlugin(): Plugin {
  return {
    name: "picket-csp",
    apply: "build",
    transformIndexHtml() {
      return [
        {
          tag: "meta",
          attrs: { "http-equiv": "Content-Security-Policy", content: BUILD_CSP },
          injectTo: "head-prepend",
        },
      ];
    },
  };
}
