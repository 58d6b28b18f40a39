/**
 * Command-line argument helpers shared by the `armdex` commands (pure: no I/O).
 */

/** Option definitions as node:util parseArgs takes them (only `type` matters here). */
export type OptionTypes = Readonly<Record<string, { readonly type: "string" | "boolean" }>>;

/**
 * Joins an option that takes a value and a following value that starts with a minus sign ("--from -300,20,600",
 * "--joints -30,10,20") into one argument ("--from=-300,20,600"), so node:util parseArgs takes negative numbers
 * instead of reporting an ambiguous option. A following option ("--to") is never taken as a value.
 * @param options the parseArgs options of the command: every `type: "string"` option takes a value
 * @example joinNegativeValues(["arm.json", "--joints", "-30,10"], { joints: { type: "string" } })
 *   // ["arm.json", "--joints=-30,10"]
 */
export function joinNegativeValues(args: readonly string[], options: OptionTypes): string[] {
  const valued = new Set(
    Object.entries(options)
      .filter(([, o]) => o.type === "string")
      .map(([name]) => `--${name}`),
  );
  const out: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!,
      next = args[i + 1];
    if (valued.has(a) && next !== undefined && /^-[\d.]/.test(next)) {
      out.push(`${a}=${next}`);
      i++;
    } else {
      out.push(a);
    }
  }
  return out;
}
