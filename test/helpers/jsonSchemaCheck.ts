/** Test helper: an independent JSON Schema checker (used by the arm and cell schema tests). */
/**
 * A minimal JSON Schema (draft 2020-12) checker for the keywords the arm and cell schemas use, written from the specification
 * (json-schema.org, Validation and Core vocabularies), independent of zod and of its JSON Schema export. Returns the
 * JSON paths that fail, "" for the root. Unknown keywords fail loudly so the checker never passes by ignoring them.
 */
export function schemaErrors(schema: Record<string, any>, value: unknown, path = ""): string[] {
  const known = new Set([
    ...["$schema", "$id", "title", "description", "format", "type", "properties", "required"],
    ...["additionalProperties", "propertyNames", "items", "prefixItems", "enum", "minItems", "maxItems"],
    ...["minimum", "maximum", "exclusiveMinimum", "minLength", "maxLength", "pattern"],
    ...["const", "not", "if", "then", "else", "anyOf", "allOf", "default"],
  ]);
  const unknown = Object.keys(schema).filter((k) => !known.has(k));
  if (unknown.length) throw new Error(`schemaErrors: unsupported keywords ${unknown.join(", ")} at ${path}`);
  const out: string[] = [];
  const at = (k: string | number) => (typeof k === "number" ? `${path}[${k}]` : path ? `${path}.${k}` : k);
  const t = schema.type as string | undefined;
  const isObject = typeof value === "object" && value !== null && !Array.isArray(value);
  const typeOk =
    t === undefined ||
    (t === "object" && isObject) ||
    (t === "array" && Array.isArray(value)) ||
    (t === "string" && typeof value === "string") ||
    (t === "number" && typeof value === "number" && Number.isFinite(value)) ||
    (t === "integer" && Number.isInteger(value)) ||
    (t === "boolean" && typeof value === "boolean");
  if (!typeOk) return [path];
  if (schema.enum && !(schema.enum as unknown[]).includes(value)) out.push(path);
  if ("const" in schema && schema.const !== value) out.push(path);
  // not: fails when the subschema passes; if/then/else: then applies where if passes, else elsewhere (§10.2).
  if (schema.not && schemaErrors(schema.not, value, path).length === 0) out.push(path);
  // anyOf: at least one subschema passes (§10.2.1.2); allOf: every one applies (§10.2.1.1).
  if (schema.anyOf && !(schema.anyOf as Record<string, any>[]).some((s) => schemaErrors(s, value, path).length === 0))
    out.push(path);
  for (const s of (schema.allOf ?? []) as Record<string, any>[]) out.push(...schemaErrors(s, value, path));
  if (schema.if) {
    const branch = schemaErrors(schema.if, value, path).length === 0 ? schema.then : schema.else;
    if (branch) out.push(...schemaErrors(branch, value, path));
  }
  if (typeof value === "number") {
    if (schema.minimum !== undefined && value < schema.minimum) out.push(path);
    if (schema.maximum !== undefined && value > schema.maximum) out.push(path);
    if (schema.exclusiveMinimum !== undefined && value <= schema.exclusiveMinimum) out.push(path);
  }
  if (typeof value === "string") {
    if (schema.minLength !== undefined && [...value].length < schema.minLength) out.push(path);
    if (schema.maxLength !== undefined && [...value].length > schema.maxLength) out.push(path);
    if (schema.pattern !== undefined && !new RegExp(schema.pattern, "u").test(value)) out.push(path);
  }
  if (Array.isArray(value)) {
    if (schema.minItems !== undefined && value.length < schema.minItems) out.push(path);
    if (schema.maxItems !== undefined && value.length > schema.maxItems) out.push(path);
    const prefix = (schema.prefixItems ?? []) as Record<string, any>[];
    value.forEach((v, i) => {
      const s = i < prefix.length ? prefix[i] : schema.items;
      if (s === false) out.push(at(i));
      else if (s) out.push(...schemaErrors(s, v, at(i)));
    });
  }
  if (isObject) {
    const obj = value as Record<string, unknown>;
    for (const k of (schema.required ?? []) as string[]) if (!(k in obj)) out.push(at(k));
    for (const [k, v] of Object.entries(obj)) {
      if (schema.propertyNames) out.push(...schemaErrors(schema.propertyNames, k, at(k)));
      const s = schema.properties?.[k] ?? schema.additionalProperties;
      if (s === false) out.push(at(k));
      else if (s && s !== true) out.push(...schemaErrors(s, v, at(k)));
    }
  }
  return out;
}
