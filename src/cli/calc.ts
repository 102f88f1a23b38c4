/**
 * `npm run calc -- <subcommand>`: radar figures an engineer checks by hand (Pd, required SNR,
 * free-space range with its link budget, radar horizon, RF exposure distances). `--json` prints a
 * machine-readable result. Bad input exits with status 2 and a message that names the flag.
 */
import { Command } from "commander";
import {
  DEFAULT_EFFECTIVE_EARTH_FACTOR,
  MAX_EFFECTIVE_EARTH_FACTOR,
  MIN_EFFECTIVE_EARTH_FACTOR,
} from "../coverage/constants.ts";
import type { SwerlingCase } from "../coverage/detection.ts";
import type { RadarModel } from "../coverage/radarModel.ts";
import { loadRadarModelFile } from "../io/radarFile.ts";
import { formatErrors } from "../io/schemaFields.ts";
import { exitStatus, parseNumber, UsageError } from "./args.ts";
import {
  type CalcOutput,
  exposureCommand,
  horizonCommand,
  pdCommand,
  rangeCommand,
  snrCommand,
} from "./calcCommands.ts";
import { readTextFile } from "./cliFiles.ts";

type Opts = Record<string, string | boolean | undefined>;

function detectionArgs(o: Opts) {
  return {
    pfa: parseNumber("--pfa", o.pfa, { min: 0, minExclusive: true, max: 1, maxExclusive: true }),
    looks: parseNumber("--looks", o.looks ?? "1", { min: 1, max: 10_000, integer: true }),
    swerling: parseNumber("--swerling", o.swerling ?? "0", { min: 0, max: 4, integer: true }) as SwerlingCase,
  };
}

function probability(flag: string, raw: unknown): number {
  return parseNumber(flag, raw, { min: 0, minExclusive: true, max: 1, maxExclusive: true });
}

function readRadar(raw: unknown): RadarModel {
  if (typeof raw !== "string" || raw === "")
    throw new UsageError("--radar", "a radar model file is required");
  const text = readTextFile("--radar", raw);
  const parsed = loadRadarModelFile(text);
  if (!parsed.ok)
    throw new UsageError("--radar", `${raw} is not a valid radar model:\n${formatErrors(parsed.errors)}`);
  return parsed.model;
}

function print<T>(out: CalcOutput<T>, json: boolean): void {
  if (json) process.stdout.write(`${JSON.stringify(out.result, null, 2)}\n`);
  else process.stdout.write(`${out.lines.join("\n")}\n`);
}

const detectionOptions = (c: Command, looksHelp = "looks integrated non-coherently (default 1)") =>
  c
    .option("--pfa <p>", "probability of false alarm, 0 < Pfa < 1")
    .option("--looks <n>", looksHelp)
    .option("--swerling <k>", "Swerling case 0-4 (0 = steady target)", "0")
    .option("--json", "machine-readable output");

export function buildCalcProgram(): Command {
  const program = new Command("calc")
    .description("Radar figures from the Picket model")
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) });

  detectionOptions(program.command("pd").description("probability of detection for a per-look SNR"))
    .option("--snr-db <dB>", "per-look SNR after coherent integration, dB")
    .action((o: Opts) => {
      const snrDb = parseNumber("--snr-db", o.snrDb, { min: -100, max: 200, unit: "dB" });
      print(pdCommand({ ...detectionArgs(o), snrDb }), o.json === true);
    });

  detectionOptions(program.command("snr").description("per-look SNR needed for a probability of detection"))
    .option("--pd <p>", "required probability of detection, 0 < Pd < 1")
    .action((o: Opts) => {
      print(snrCommand({ ...detectionArgs(o), pd: probability("--pd", o.pd) }), o.json === true);
    });

  detectionOptions(
    program.command("range").description("free-space detection range and link budget"),
    "looks integrated non-coherently (default: the radar model's)",
  )
    .option("--radar <file>", "radar model file (JSON)")
    .option("--rcs-dbsm <dBsm>", "target RCS, dBsm")
    .option("--pd <p>", "required probability of detection, 0 < Pd < 1")
    .action((o: Opts) => {
      const radar = readRadar(o.radar);
      const rcsDbsm = parseNumber("--rcs-dbsm", o.rcsDbsm, { min: -60, max: 60, unit: "dBsm" });
      const args = detectionArgs({ ...o, looks: o.looks ?? String(radar.looksIntegrated ?? 1) });
      print(rangeCommand({ ...args, radar, rcsDbsm, pd: probability("--pd", o.pd) }), o.json === true);
    });

  program
    .command("horizon")
    .description("radar horizon over a smooth Earth")
    .option("--mast-m <m>", "antenna height above ground, m")
    .option("--target-m <m>", "target height above ground, m")
    .option("--k <k>", "effective-Earth factor (4/3 standard, 1 geometric)", "4/3")
    .option("--json", "machine-readable output")
    .action((o: Opts) => {
      const mastM = parseNumber("--mast-m", o.mastM, { min: 0, max: 300, unit: "m" });
      const targetM = parseNumber("--target-m", o.targetM, { min: 0, max: 30_000, unit: "m" });
      const k = parseNumber("--k", o.k ?? String(DEFAULT_EFFECTIVE_EARTH_FACTOR), {
        min: MIN_EFFECTIVE_EARTH_FACTOR,
        max: MAX_EFFECTIVE_EARTH_FACTOR,
      });
      print(horizonCommand({ mastM, targetM, k }), o.json === true);
    });

  program
    .command("exposure")
    .description("RF exposure compliance distances (ICNIRP 2020, FCC 47 CFR 1.1310)")
    .option("--radar <file>", "radar model file (JSON)")
    .option("--json", "machine-readable output")
    .action((o: Opts) => {
      print(exposureCommand(readRadar(o.radar)), o.json === true);
    });

  return program;
}

/** Run the program; returns the exit status (0 ok, 2 usage error). */
export function runCalc(argv: string[]): number {
  try {
    buildCalcProgram().parse(argv, { from: "user" });
    return 0;
  } catch (e) {
    return exitStatus("calc", e);
  }
}

if (import.meta.url === `file://${process.argv[1]}` || process.argv[1]?.endsWith("calc.ts")) {
  process.exitCode = runCalc(process.argv.slice(2));
}
