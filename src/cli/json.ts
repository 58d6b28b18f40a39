/** JSON for people: indented objects, but arrays of numbers (vectors, matrix rows) kept on one line. */
export function stringifyCompact(value: unknown, indent = "  ", depth = 0): string {
  const pad = indent.repeat(depth + 1),
    end = indent.repeat(depth);
  if (Array.isArray(value)) {
    if (value.every((v) => typeof v === "number" || v === null)) return JSON.stringify(value);
    if (value.length === 0) return "[]";
    return `[\n${value.map((v) => pad + stringifyCompact(v, indent, depth + 1)).join(",\n")}\n${end}]`;
  }
  if (value !== null && typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
    if (entries.length === 0) return "{}";
    const flat = JSON.stringify(value);
    if (entries.every(([, v]) => v === null || typeof v !== "object") && flat.length <= 80) return flat;
    return `{\n${entries.map(([k, v]) => `${pad}${JSON.stringify(k)}: ${stringifyCompact(v, indent, depth + 1)}`).join(",\n")}\n${end}}`;
  }
  return JSON.stringify(value) ?? "null";
}
