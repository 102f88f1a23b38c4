#!/usr/bin/env node
// Installed entry for `picket-calc` and `npm run calc`: runs src/cli/calc.ts from its bundle (launch.mjs).
import { loadEntry } from "./launch.mjs";

const { runCalc } = await loadEntry("calc");
process.exitCode = runCalc(process.argv.slice(2));
