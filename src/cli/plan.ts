/**
 * `npm run plan -- <subcommand>` (or the `picket-plan` bin): headless runs with the same engine as the app.
 *   evaluate <plan.json> [--out DIR] [--json] [--mode accurate|fast]
 *   point <plan.json> --at LAT,LON --height-m H [--json]
 *   los --dem FILE (--at LAT,LON | --at-xy X,Y) --mast-m H [--target-m H] [--k K] [--mode M] --out FILE.tif
 * Exit status: 0 done, 1 the run failed (file, terrain, grid), 2 bad input (flag or plan field named).
 * Each subcommand's module is imported when it runs, so `los` starts without the plan schema.
 */
import { Command } from "commander";
import { exitStatus, type Opts } from "./args.ts";

export function buildPlanProgram(): Command {
  const program = new Command("plan")
    .description("Coverage runs on Picket plan files")
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) });
  program
    .command("evaluate")
    .description("evaluate a plan: coverage table, metrics JSON and GeoTIFFs")
    .argument("<plan.json>", "plan file")
    .option("--out <dir>", "write metrics.json and per-height GeoTIFFs into this directory")
    .option("--mode <mode>", "masking mode: accurate or fast (default: the plan's)")
    .option("--json", "print the metrics as JSON")
    .action(async (planPath: string, o: Opts) =>
      (await import("./planSite.ts")).evaluateCommand(planPath, o),
    );
  program
    .command("point")
    .description("inspect one position: per radar link budget, visibility, diffraction, Pd")
    .argument("<plan.json>", "plan file")
    .option("--at <lat,lon>", "position, decimal degrees WGS84")
    .option("--height-m <m>", "target height above ground, m")
    .option("--json", "machine-readable output")
    .action(async (planPath: string, o: Opts) => (await import("./planSite.ts")).pointCommand(planPath, o));
  program
    .command("los")
    .description("one observer's visibility raster on a DEM's own grid")
    .option("--dem <file>", "DEM GeoTIFF in a projected CRS")
    .option("--at <lat,lon>", "observer position, decimal degrees WGS84")
    .option("--at-xy <x,y>", "observer position in the DEM's CRS, m")
    .option("--mast-m <m>", "antenna height above ground, m")
    .option("--target-m <m>", "target height above ground, m: output 1 visible / 0 hidden instead of heights")
    .option("--k <k>", "effective-Earth factor (4/3 standard, 1 geometric)")
    .option("--mode <mode>", "masking mode: accurate or fast", "accurate")
    .option("--out <file.tif>", "output GeoTIFF")
    .option("--json", "machine-readable output")
    .action(async (o: Opts) => (await import("./planLos.ts")).losCommand(o));
  return program;
}

/** Run the program; resolves to the exit status (0 ok, 1 run failed, 2 bad input). */
export async function runPlan(argv: string[]): Promise<number> {
  try {
    await buildPlanProgram().parseAsync(argv, { from: "user" });
    return 0;
  } catch (e) {
    return exitStatus("plan", e);
  }
}

if (import.meta.url === `file://${process.argv[1]}` || process.argv[1]?.endsWith("plan.ts")) {
  runPlan(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
