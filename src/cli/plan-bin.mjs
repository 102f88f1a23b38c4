#!/usr/bin/env node
// Installed entry for `picket-plan` and `npm run plan`: runs src/cli/plan.ts from its bundle (launch.mjs).
import { loadEntry } from "./launch.mjs";

const { runPlan } = await loadEntry("plan");
process.exitCode = await runPlan(process.argv.slice(2));
