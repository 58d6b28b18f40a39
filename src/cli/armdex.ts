/**
 * armdex command line: thin entry points over the catalog and the core.
 *   armdex check [paths…]                         validate arm and cell files or folders (default: arms/, arms/cells/)
 *   armdex pose <arm.json> --joints q1,q2,… [--tool x,y,z] [--allow-outside]
 *   armdex line <arm.json> --from x,y,z --to x,y,z --orientation down|outward|r,p,y --speed mm/s [--start-joints q1,…] [--tool x,y,z] [--samples N]
 *   armdex import urdf <file.urdf> --root <link> --tip <link> --id <id> [--merge <datasheet.json>]
 *   armdex export urdf <arm.json>
 *   armdex cell <cell.json> [--arms a,b]            cell study of the candidate arms as JSON
 *   armdex place <cell.json> --arm <id> [--grid-mm 50] [--yaw-step-deg 15]
 *   armdex schema [arm.json [cell.json]]          write the JSON Schemas of the arm and cell formats
 * Exit codes: 0 success, 1 invalid arm data, 2 usage error.
 */
import { parseArgs } from "node:util";
import { writeFileAtomic } from "../catalog/files";
import { analysisWarningText } from "../view/warningText";
import { armJsonSchema, cellJsonSchema, formatIssue, loadArmFile, loadArms, type LoadResult } from "../catalog";
import { checkPaths, reportCheck, type CheckResult } from "./check";
import { joinNegativeValues } from "./args";
import { POSE_OPTIONS, poseCommand } from "./pose";
import { LINE_OPTIONS, lineCommand } from "./line";
import { stringifyCompact } from "./json";
import { exportUrdfCommand, importUrdfCommand } from "./urdf";
import { cellCommand, placeCommand } from "./cell";

export class UsageError extends Error {}

/** The catalog folder: ARMDEX_ARMS_DIR or arms/. */
function defaultArmsDir(): string {
  return process.env.ARMDEX_ARMS_DIR ?? "arms";
}

const HELP = `armdex — arm catalog tools

usage:
  armdex check [paths…]          validate arm and cell files or folders (default: arms/ and arms/cells/); exit 1
                                 on any error. A cell is checked against the arms of the run, or of the default
                                 folder (ARMDEX_ARMS_DIR or arms/) when the run names no arm folder
  armdex pose <arm.json> --joints q1,q2,… [--tool x,y,z] [--allow-outside]
                                 pose, Jacobian and singular values as JSON (joints in deg or mm; tool in mm)
  armdex analyze <arm.json>      the arm's full analysis as JSON (envelope, speed maps, singularities, payload, cycle)
  armdex analyze --all [folder]  analyse every arm of a folder (default: arms/) into the cache, in parallel
  armdex line <arm.json> --from x,y,z --to x,y,z --orientation down|outward|r,p,y --speed mm/s
             [--start-joints q1,…] [--tool x,y,z] [--samples N]
                                 straight-line check as JSON: joint rates along the TCP line at constant
                                 orientation, feasible constant speed, bottleneck, singularities, branch changes
                                 (mm, deg, mm/s; r,p,y in deg, URDF fixed axes; start joints in deg or mm)
  armdex import urdf <file.urdf> --root <link> --tip <link> --id <id> [--merge <datasheet.json>]
                                 an arm file (frames convention) from the URDF chain root → tip on stdout; the
                                 merge file adds what URDF lacks (maker, model, ratings…); what the check still
                                 misses goes to stderr. Xacro files must be expanded to URDF first
  armdex export urdf <arm.json>  the URDF of the arm's kinematic chain (SI units, no meshes) on stdout
  armdex cell <cell.json> [--arms a,b]
                                 cell study as JSON: for each candidate (or the arms named) the tool load against
                                 its ratings, every target's solutions and margins, the moves with their times and
                                 problems, the cycle time and a verdict with reasons (mm, deg, s)
  armdex place <cell.json> --arm <id> [--grid-mm 50] [--yaw-step-deg 15]
                                 placement map as JSON: base positions on the placement plane from which the arm
                                 reaches every target, their margins, and the fastest position found
  armdex schema [arm.json [cell.json]]
                                 write the arm and cell JSON Schemas (default: public/schema/arm.schema.json and
                                 public/schema/cell.schema.json; with one path, only the arm schema)
  armdex prepare [folder]        schemas, check (arms and cells) and analyze --all in one pass (each arm file read
                                 once): the first step of \`npm run build\`
`;

async function check(paths: string[], json: boolean): Promise<number> {
  return reportCheck(await checkPaths(paths, defaultArmsDir()), json);
}

/**
 * Analyses every arm of a load result into the cache (parallel workers), printing the counts and the warnings;
 * `older` (earlier revisions of the arms) go through the same pool, their warnings are not printed.
 */
async function analyseAll(
  arms: LoadResult["arms"],
  workers: number | undefined,
  older: LoadResult["arms"] = [],
): Promise<number> {
  const { analyseCatalog, getAnalysisSummary } = await import("../catalog/analysis");
  const t0 = performance.now();
  const report = await analyseCatalog([...arms, ...older], { workers, log: (l) => process.stdout.write(`${l}\n`) });
  process.stdout.write(
    `${report.analysed.length} analysed, ${report.cached.length} from the cache, in ${((performance.now() - t0) / 1000).toFixed(1)} s\n`,
  );
  for (const arm of arms) {
    for (const w of (await getAnalysisSummary(arm)).warnings)
      process.stdout.write(`warning: ${arm.file}: ${analysisWarningText(w)}\n`);
  }
  return 0;
}

/**
 * `armdex prepare`: what the site build needs before Astro runs, with each arm file read and validated once:
 * the JSON Schemas, the check of every arm file and of every cell file in the folder's `cells/` (any error stops
 * the build before anything is published), the arm files' earlier revisions from the repository's history, the
 * analyses of both (cached, in parallel), the revision data the pages read, and the cell studies and placement maps
 * (cached).
 */
async function prepare(paths: string[], workers: number | undefined): Promise<number> {
  const loaded = await checkPaths(paths, defaultArmsDir());
  await schema([]);
  if (reportCheck(loaded, false) !== 0) return 1;
  const { prepareRevisions } = await import("./revisions");
  const arms = loaded.arms.arms;
  const code = await prepareRevisions(arms, (older) => analyseAll(arms, workers, older));
  if (code !== 0) return code;
  return prepareCells(loaded.cells.cells, arms);
}

/** Cell studies and placement maps of every cell into the cache (computed once per content). */
async function prepareCells(cells: CheckResult["cells"]["cells"], arms: LoadResult["arms"]): Promise<number> {
  const { getCellResults } = await import("../catalog/cellResults");
  for (const cell of cells) {
    const { computed, ms } = await getCellResults(cell, arms);
    process.stdout.write(
      `cell ${cell.id}: ${computed ? `studied in ${(ms / 1000).toFixed(1)} s` : "from the cache"}\n`,
    );
  }
  return 0;
}

/** Writes the arm and cell JSON Schemas; with one path, only the arm schema (to that path). */
async function schema(out: readonly string[]): Promise<number> {
  const targets: [string, Record<string, unknown>][] = [[out[0] ?? "public/schema/arm.schema.json", armJsonSchema()]];
  if (out.length !== 1) targets.push([out[1] ?? "public/schema/cell.schema.json", cellJsonSchema()]);
  for (const [path, json] of targets) {
    await writeFileAtomic(path, `${JSON.stringify(json, null, 2)}\n`);
    process.stdout.write(`wrote ${path}\n`);
  }
  return 0;
}

export async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  if (!command || command === "help" || command === "--help" || command === "-h") {
    process.stdout.write(HELP);
    return command ? 0 : 2;
  }
  switch (command) {
    case "check": {
      const { values, positionals } = parseArgs({
        args: rest,
        allowPositionals: true,
        options: { json: { type: "boolean" } },
      });
      return check(positionals, values.json ?? false);
    }
    case "pose": {
      const { values, positionals } = parseArgs({
        args: joinNegativeValues(rest, POSE_OPTIONS),
        allowPositionals: true,
        options: POSE_OPTIONS,
      });
      if (positionals.length !== 1) throw new UsageError("pose needs exactly one arm file");
      if (!values.joints) throw new UsageError("pose needs --joints q1,q2,… (driven joints, deg or mm)");
      const loaded = await loadArmFile(positionals[0]!);
      if (!loaded.arm) {
        for (const i of loaded.issues) process.stderr.write(`${formatIssue(i)}\n`);
        return 1;
      }
      const result = poseCommand(loaded.arm, values.joints, values.tool, values["allow-outside"] ?? false);
      if (!result.ok) {
        process.stderr.write(`error: ${result.message}\n`);
        return result.usage ? 2 : 1;
      }
      process.stdout.write(`${stringifyCompact(result.value)}\n`);
      return 0;
    }
    case "analyze":
    case "analyse": {
      const { values, positionals } = parseArgs({
        args: rest,
        allowPositionals: true,
        options: { all: { type: "boolean" }, workers: { type: "string" } },
      });
      const { getAnalysis } = await import("../catalog/analysis");
      if (values.all) {
        const { arms, issues } = await loadArms(positionals.length ? positionals : [defaultArmsDir()]);
        const errors = issues.filter((i) => i.severity === "error");
        if (errors.length) {
          for (const i of errors) process.stderr.write(`${formatIssue(i)}\n`);
          return 1;
        }
        return analyseAll(arms, values.workers ? Number(values.workers) : undefined);
      }
      if (positionals.length !== 1) throw new UsageError("analyze needs one arm file, or --all");
      const loaded = await loadArmFile(positionals[0]!);
      if (!loaded.arm) {
        for (const i of loaded.issues) process.stderr.write(`${formatIssue(i)}\n`);
        return 1;
      }
      process.stdout.write(`${JSON.stringify(await getAnalysis(loaded.arm))}\n`);
      return 0;
    }
    case "line": {
      const { values, positionals } = parseArgs({
        args: joinNegativeValues(rest, LINE_OPTIONS),
        allowPositionals: true,
        options: LINE_OPTIONS,
      });
      if (positionals.length !== 1) throw new UsageError("line needs exactly one arm file");
      const loaded = await loadArmFile(positionals[0]!);
      if (!loaded.arm) {
        for (const i of loaded.issues) process.stderr.write(`${formatIssue(i)}\n`);
        return 1;
      }
      const result = lineCommand(loaded.arm, { ...values, startJoints: values["start-joints"] });
      if (!result.ok) {
        process.stderr.write(`error: ${result.message}\n`);
        return result.usage ? 2 : 1;
      }
      process.stdout.write(`${stringifyCompact(result.value)}\n`);
      return 0;
    }
    case "import":
    case "export": {
      if (rest[0] !== "urdf") throw new UsageError(`${command} knows one format: ${command} urdf …`);
      const usage = (m: string) => new UsageError(m);
      const out = await (command === "import" ? importUrdfCommand : exportUrdfCommand)(rest.slice(1), usage);
      process.stdout.write(out.stdout);
      process.stderr.write(out.stderr);
      return out.code;
    }
    case "cell":
    case "place": {
      const usage = (m: string) => new UsageError(m);
      const out = await (command === "cell" ? cellCommand : placeCommand)(rest, usage);
      process.stdout.write(out.stdout);
      process.stderr.write(out.stderr);
      return out.code;
    }
    case "schema":
      if (rest.length > 2) throw new UsageError("schema takes at most two paths: the arm schema, the cell schema");
      return schema(rest);
    case "prepare": {
      const { values, positionals } = parseArgs({
        args: rest,
        allowPositionals: true,
        options: { workers: { type: "string" } },
      });
      return prepare(positionals, values.workers ? Number(values.workers) : undefined);
    }
    default:
      throw new UsageError(`unknown command "${command}"`);
  }
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    if (
      e instanceof UsageError ||
      (e instanceof TypeError && (e as { code?: string }).code?.startsWith("ERR_PARSE_ARGS"))
    ) {
      process.stderr.write(`error: ${e.message}\n\n${HELP}`);
      process.exitCode = 2;
    } else {
      process.stderr.write(`error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
      process.exitCode = 1;
    }
  },
);
