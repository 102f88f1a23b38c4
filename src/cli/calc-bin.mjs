#!/usr/bin/env node
// Installed entry for `picket-calc`: registers tsx so the TypeScript CLI runs without a build step.
import { register } from "tsx/esm/api";

register();
const { runCalc } = await import("./calc.ts");
process.exitCode = runCalc(process.argv.slice(2));
