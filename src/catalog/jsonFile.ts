/** Reading one JSON data file (arm or cell) with friendly errors, and checking its `$schema` reference. Node-only. */
import { readFile, stat } from "node:fs/promises";
import { relative, resolve } from "node:path";
import type { ArmIssue } from "./issues";

function lineColumn(text: string, position: number): string {
  const before = text.slice(0, position);
  const line = before.split("\n").length;
  const column = position - before.lastIndexOf("\n");
  return `line ${line}, column ${column}`;
}

/** The first word outside string literals that is not true, false, null or a number (NaN, Infinity, undefined…). */
function firstBareWord(text: string): { index: number; word: string } | null {
  const token = /"(?:[^"\\]|\\.)*"?|[A-Za-z_$][\w$]*|-?\d[\d.eE+-]*/g;
  for (let m = token.exec(text); m; m = token.exec(text)) {
    const w = m[0];
    if (w.startsWith('"') || /^[-\d]/.test(w) || w === "true" || w === "false" || w === "null") continue;
    return { index: m.index, word: w };
  }
  return null;
}

export type JsonRead =
  | { readonly ok: true; readonly file: string; readonly data: unknown }
  | { readonly ok: false; readonly file: string; readonly issues: ArmIssue[] };

/**
 * Reads a UTF-8 JSON file. Never throws for bad data: an unreadable, empty, non-UTF-8 or malformed file comes back as
 * one issue naming the file (relative to the working directory) and the line and column of a syntax error.
 * @param what what the file describes, for the empty-file message ("one arm", "one cell")
 */
export async function readJsonFile(path: string, what: string): Promise<JsonRead> {
  const file = relative(process.cwd(), path) || path;
  const err = (message: string): JsonRead => ({
    ok: false,
    file,
    issues: [{ file, path: "", message, severity: "error" }],
  });
  let bytes: Buffer;
  try {
    const info = await stat(path);
    if (!info.isFile()) return err("expected a JSON file, found a directory or other non-file");
    bytes = await readFile(path);
  } catch (e) {
    return err(`cannot read the file: ${(e as NodeJS.ErrnoException).code ?? String(e)}`);
  }
  return parseJsonBytes(bytes, file, what);
}

/**
 * Parses the bytes of a UTF-8 JSON file, wherever they came from (the disk, or a file's earlier version in the
 * repository's history), with the same friendly errors as readJsonFile. `file` names it in issues.
 */
export function parseJsonBytes(bytes: Uint8Array, file: string, what: string): JsonRead {
  const err = (message: string): JsonRead => ({
    ok: false,
    file,
    issues: [{ file, path: "", message, severity: "error" }],
  });
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return err("expected UTF-8 text, found bytes that are not valid UTF-8 (save the file as UTF-8)");
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  if (text.trim() === "") return err(`expected a JSON object describing ${what}, found an empty file`);
  try {
    return { ok: true, file, data: JSON.parse(text) as unknown };
  } catch (e) {
    // V8 names an unexpected letter without its position and quotes a multi-line excerpt: locate the bare word.
    const msg = (e instanceof Error ? e.message : String(e)).replace(/, (?:\.\.\.)?"[\s\S]*is not valid JSON$/, "");
    const pos = /position (\d+)/.exec(msg);
    const at = pos ? Number(pos[1]) : /^Unexpected token/.test(msg) ? firstBareWord(text)?.index : undefined;
    const word = at === undefined ? undefined : /^[A-Za-z_$][\w$]*/.exec(text.slice(at))?.[0];
    const where = at !== undefined ? ` at ${lineColumn(text, at)}` : "";
    const truncated = /end of JSON input|Unterminated/.test(msg) ? " (the file looks truncated)" : "";
    const reason =
      word === "NaN" || word === "Infinity"
        ? `${msg}: ${word} is not a JSON number (JSON has no NaN or Infinity: write a finite number, or leave an optional field out)`
        : word && !pos
          ? `${msg}: found the bare word ${word} (text must be in double quotes)`
          : msg;
    return err(`expected valid JSON, found a syntax error${where}${truncated}: ${reason}`);
  }
}

/**
 * Checks a `$schema` reference: a URL must end in /<kind>.schema.json, a path must point to a file.
 * @param kind "arm" or "cell" @param example a relative path that works from the file's folder, for the message
 * @returns null when fine, else the message
 */
export async function checkSchemaRef(
  ref: string,
  baseDir: string,
  kind: string,
  example: string,
): Promise<string | null> {
  if (/^https?:\/\//.test(ref)) {
    return ref.endsWith(`/${kind}.schema.json`)
      ? null
      : `expected a URL ending in /${kind}.schema.json, found ${JSON.stringify(ref)}`;
  }
  const target = resolve(baseDir, ref.replace(/^file:\/\//, "").split("#")[0]!);
  try {
    if ((await stat(target)).isFile()) return null;
  } catch {
    /* fall through */
  }
  return `expected a path to the ${kind} JSON Schema (e.g. "${example}"), found ${JSON.stringify(ref)}, which points to no file`;
}
