/**
 * `armdex import urdf <file.urdf> --root <link> --tip <link> --id <id> [--merge <datasheet.json>]`: prints an arm
 * file (frames convention) on stdout; what `armdex check` would still report goes to stderr (exit 1 then).
 * `armdex export urdf <arm.json>`: prints the URDF of the arm's kinematic chain.
 * Exit codes as armdex: 0 success, 1 invalid data, 2 usage error.
 */
import { readFile } from "node:fs/promises";
import { parseArgs } from "node:util";
import { formatIssue, loadArmFile, plausibilityWarnings, validateArm } from "../catalog";
import { exportUrdf, importUrdf, UrdfError, type UrdfMerge } from "../catalog/urdf";

export const IMPORT_URDF_OPTIONS = {
  root: { type: "string" },
  tip: { type: "string" },
  id: { type: "string" },
  merge: { type: "string" },
} as const;

/** Output of a command: what to print where, and the exit code. */
export interface UrdfCommandOutput {
  readonly stdout: string;
  readonly stderr: string;
  readonly code: number;
}

async function readText(path: string, what: string): Promise<string> {
  try {
    return await readFile(path, "utf8");
  } catch (e) {
    throw new UrdfError(`cannot read the ${what} ${path}: ${(e as NodeJS.ErrnoException).code ?? String(e)}`);
  }
}

/**
 * JSON laid out as the demo arm files are: an array or object on one line when it holds no object with objects
 * inside and fits in 100 characters (`"origin": { "xyzMm": [0, 0, 400], "rpyDeg": [0, 0, 0] }`), else one entry a line.
 */
export function armFileJson(value: unknown, depth = 0): string {
  const pad = "  ".repeat(depth + 1),
    end = "  ".repeat(depth);
  const inline = (v: unknown): string =>
    Array.isArray(v)
      ? `[${v.map(inline).join(", ")}]`
      : v !== null && typeof v === "object"
        ? `{ ${Object.entries(v)
            .filter(([, x]) => x !== undefined)
            .map(([k, x]) => `${JSON.stringify(k)}: ${inline(x)}`)
            .join(", ")} }`
        : JSON.stringify(v);
  if (value === null || typeof value !== "object") return JSON.stringify(value);
  const one = inline(value);
  if (one.length + depth * 2 <= 100 && !/[{[][^{}[\]]*[{[][^{}[\]]*[{[]/.test(one)) return one;
  if (Array.isArray(value)) return `[\n${value.map((v) => pad + armFileJson(v, depth + 1)).join(",\n")}\n${end}]`;
  const entries = Object.entries(value).filter(([, v]) => v !== undefined);
  return `{\n${entries.map(([k, v]) => `${pad}${JSON.stringify(k)}: ${armFileJson(v, depth + 1)}`).join(",\n")}\n${end}}`;
}

/** `armdex import urdf …` (args after `urdf`). Usage errors are thrown as `usage(message)`. */
export async function importUrdfCommand(
  args: readonly string[],
  usage: (message: string) => Error,
): Promise<UrdfCommandOutput> {
  const { values, positionals } = parseArgs({ args: [...args], allowPositionals: true, options: IMPORT_URDF_OPTIONS });
  if (positionals.length !== 1) throw usage("import urdf needs exactly one URDF file");
  for (const k of ["root", "tip", "id"] as const)
    if (!values[k]) throw usage(`import urdf needs --${k} <${k === "id" ? "arm id, e.g. maker-model" : "link name"}>`);
  const file = positionals[0]!;
  try {
    let merge: UrdfMerge | undefined;
    if (values.merge) {
      const text = await readText(values.merge, "merge file");
      try {
        merge = JSON.parse(text) as UrdfMerge;
      } catch (e) {
        throw new UrdfError(`merge file ${values.merge}: expected JSON, ${(e as Error).message}`);
      }
      if (merge === null || typeof merge !== "object" || Array.isArray(merge))
        throw new UrdfError(`merge file ${values.merge}: expected a JSON object of arm-file fields`);
    }
    const arm = importUrdf(await readText(file, "URDF file"), {
      root: values.root!,
      tip: values.tip!,
      id: values.id!,
      merge,
      sourceName: file.split("/").pop(),
    });
    const target = `arms/${values.id}.json`;
    const result = validateArm(arm, target, values.id!);
    const issues = [...result.issues, ...(result.ok ? plausibilityWarnings(result.spec, target) : [])];
    const errors = issues.filter((i) => i.severity === "error");
    const stderr = errors.length
      ? `${errors.length} thing${errors.length === 1 ? "" : "s"} to add or fix before ${target} passes armdex check` +
        `${values.merge ? "" : " (give them in a --merge file)"}:\n`
      : "";
    return {
      stdout: `${armFileJson(arm)}\n`,
      stderr: stderr + issues.map((i) => `${formatIssue(i)}\n`).join(""),
      code: errors.length ? 1 : 0,
    };
  } catch (e) {
    if (e instanceof UrdfError) return { stdout: "", stderr: prefixLines(e.message, file), code: 1 };
    throw e;
  }
}

/** One `error: <file>: <problem>` line per problem. */
function prefixLines(text: string, file: string): string {
  return text
    .split("\n")
    .map((l) => `error: ${file}: ${l}\n`)
    .join("");
}

/** `armdex export urdf <arm.json>` (args after `urdf`). */
export async function exportUrdfCommand(
  args: readonly string[],
  usage: (message: string) => Error,
): Promise<UrdfCommandOutput> {
  if (args.length !== 1) throw usage("export urdf needs exactly one arm file");
  const loaded = await loadArmFile(args[0]!);
  if (!loaded.arm) return { stdout: "", stderr: loaded.issues.map((i) => `${formatIssue(i)}\n`).join(""), code: 1 };
  return { stdout: exportUrdf(loaded.arm.spec, loaded.arm.chain), stderr: "", code: 0 };
}
