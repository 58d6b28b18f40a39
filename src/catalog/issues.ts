/** Validation issues as data: file, JSON path, and a message that says what was expected and what was found. */
export interface ArmIssue {
  readonly file: string;
  /** JSON path such as `joints[2].rangeDeg`; empty for the whole file. */
  readonly path: string;
  readonly message: string;
  readonly severity: "error" | "warning";
}

/** `joints[2].rangeDeg` from ["joints", 2, "rangeDeg"]. */
export function toPath(segments: readonly PropertyKey[]): string {
  let out = "";
  for (const s of segments) {
    if (typeof s === "number") out += `[${s}]`;
    else if (typeof s === "string" && /^[A-Za-z_$][\w$]*$/.test(s)) out += out ? `.${s}` : s;
    else out += `[${JSON.stringify(String(s))}]`;
  }
  return out;
}

/** Short, safe rendering of a found value for messages. */
export function describeValue(value: unknown): string {
  if (value === undefined) return "nothing";
  if (typeof value === "string") return JSON.stringify(value.length > 60 ? `${value.slice(0, 57)}...` : value);
  if (typeof value === "number" || typeof value === "boolean" || value === null) return String(value);
  if (Array.isArray(value)) {
    const s = JSON.stringify(value);
    return s.length > 80 ? `an array of ${value.length} items` : s;
  }
  return "an object";
}

export function formatIssue(issue: ArmIssue): string {
  const where = issue.path ? `${issue.file}: ${issue.path}` : issue.file;
  return `${issue.severity === "warning" ? "warning" : "error"}: ${where}: ${issue.message}`;
}
