// worker_threads entry for the coverage benchmark: registers tsx so the TypeScript worker API loads
// (a Worker pointed straight at a .ts file fails under tsx).
import { register } from "tsx/esm/api";

register();
await import("./coverageWorkerApi.ts");
