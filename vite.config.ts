/// <reference types="vitest/config" />
import react from "@vitejs/plugin-react";
import { defineConfig } from "vite";
import { cspPlugin } from "./src/ui/csp.ts";

export default defineConfig({
  plugins: [react(), cspPlugin()],
  resolve: {
    alias: [
      // osmtogeojson bundles a Lo-Dash 2 build that compiles functions with Function() at load time, which a
      // strict Content-Security-Policy (no eval) forbids; lodash 4 has the same six functions without it.
      { find: /^\.\/lodash\.custom\.js$/, replacement: "lodash" },
    ],
  },
  worker: { format: "es" },
  // PICKET_NO_MINIFY=1 keeps the functions' names in the bundle, for the browser bench's traces.
  build: { target: "es2022", sourcemap: true, minify: !process.env.PICKET_NO_MINIFY },
  // `npm start` opens the planner in the default browser; set BROWSER=none (or run under CI) to stay quiet.
  server: { host: "127.0.0.1", port: 5173, open: !process.env.CI },
  test: {
    include: ["src/**/*.test.ts", "tests/**/*.test.ts", "tests/**/*.test.tsx"],
    exclude: ["node_modules", "dist"],
    testTimeout: 30000,
    hookTimeout: 120000,
  },
});
