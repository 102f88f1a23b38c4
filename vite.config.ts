/// <reference types="vitest/config" />
import react from "@vitejs/plugin-react";
import { defineConfig } from "vite";
import { cspPlugin } from "./src/ui/csp.ts";

export default defineConfig({
  plugins: [react(), cspPlugin()],
  worker: { format: "es" },
  build: { target: "es2022", sourcemap: true },
  server: { host: "127.0.0.1", port: 5173 },
  test: {
    include: ["src/**/*.test.ts", "tests/**/*.test.ts", "tests/**/*.test.tsx"],
    exclude: ["node_modules", "dist"],
    testTimeout: 30000,
    hookTimeout: 120000,
  },
});
