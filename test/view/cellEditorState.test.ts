import { describe, expect, it } from "vitest";
import { validateCell } from "../../src/catalog/cell/validate";
import {
  applyFormChange,
  base64UrlOfBytes,
  bytesOfBase64Url,
  CELL_SCHEMA_REF,
  cellFileText,
  decodeState,
  encodeState,
  fieldValue,
  getAt,
  parentPath,
  pruneOptional,
  renameReferences,
  setAt,
  slotOf,
  starterCell,
  stateOfHash,
  switchTargetForm,
  type JsonObject,
} from "../../src/view/cellEditorState";
import { mulberry32 } from "../helpers/prng";
import { CELL } from "./cellFixtures";

const copy = (): JsonObject => JSON.parse(JSON.stringify(CELL)) as JsonObject;

describe("base64url", () => {
  it("matches Node's own base64url encoder (Buffer, RFC 4648 §5) on random bytes of every length 0–64", () => {
    // Reference: Node's Buffer implementation, independent of ours.
    const rand = mulberry32(12);
    for (let n = 0; n <= 64; n++) {
      const bytes = Uint8Array.from({ length: n }, () => Math.floor(rand() * 256));
      const ours = base64UrlOfBytes(bytes);
      expect(ours).toBe(Buffer.from(bytes).toString("base64url"));
      expect(Array.from(bytesOfBase64Url(ours))).toEqual(Array.from(bytes));
    }
  });

  it("reads padded input and refuses characters outside the alphabet", () => {
    // RFC 4648 §10 test vector: BASE64("foob") = "Zm9vYg==" (the same in the url alphabet).
    expect(new TextDecoder().decode(bytesOfBase64Url("Zm9vYg=="))).toBe("foob");
    expect(() => bytesOfBase64Url("ab+c")).toThrow(/invalid base64url character "\+" at 2/);
    expect(() => bytesOfBase64Url("abcde")).toThrow(/invalid base64url length/);
  });
});

describe("state in the address", () => {
  it("round-trips a cell with non-ASCII text (°, ·, ü) exactly", () => {
    const cell = { ...copy(), title: "Zelle · 90° drehen, Grüße" };
    const encoded = encodeState(cell);
    expect(encoded).toMatch(/^[A-Za-z0-9_-]+$/);
    const back = decodeState(encoded);
    expect(back).toEqual({ ok: true, value: cell });
    // The encoding is base64url of the UTF-8 JSON: Node decodes it to the same text.
    expect(Buffer.from(encoded, "base64url").toString("utf8")).toBe(JSON.stringify(cell));
  });

  it("reports what is wrong with a damaged state", () => {
    const r = decodeState("e30x!");
    expect(r.ok).toBe(false);
    const bad = decodeState(Buffer.from("{not json", "utf8").toString("base64url"));
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.error).toMatch(/^the cell in the address could not be read: /);
  });

  it("finds the state among the fragment's parameters", () => {
    expect(stateOfHash("#state=abc")).toBe("abc");
    expect(stateOfHash("#x=1&state=e30")).toBe("e30");
    expect(stateOfHash("")).toBeNull();
  });
});

describe("fields", () => {
  it("reads numbers, blanks and text as the validator should see them", () => {
    expect(fieldValue("number", " 12.5 ")).toBe(12.5);
    expect(fieldValue("number", "-0.5")).toBe(-0.5);
    expect(fieldValue("number", "")).toBeUndefined();
    expect(fieldValue("number", "12 kg")).toBe("12 kg");
    expect(fieldValue("text", "  ")).toBeUndefined();
    expect(fieldValue("text", "die")).toBe("die");
  });

  it("writes and removes values by path, making containers on the way", () => {
    const c = copy();
    setAt(c, ["parts", 0, "inertiaKgM2", "xx"], 0.5);
    expect(getAt(c, ["parts", 0, "inertiaKgM2"])).toEqual({ xx: 0.5 });
    setAt(c, ["parts", 0, "inertiaKgM2", "xx"], undefined);
    pruneOptional(c, ["parts", 0, "inertiaKgM2", "xx"]);
    expect(getAt(c, ["parts", 0])).toEqual({ name: "box", massKg: 3, cogMm: [0, 0, 100] });
    setAt(c, ["requirements", "maxCycleS"], undefined);
    setAt(c, ["requirements", "minJointMarginDeg"], undefined);
    pruneOptional(c, ["requirements", "minJointMarginDeg"]);
    expect("requirements" in c).toBe(false);
    setAt(c, ["placement", "positionMm", 2], undefined);
    expect(getAt(c, ["placement", "positionMm"])).toEqual([0, 0, null]);
  });
});

describe("structural changes", () => {
  it("renames a target in relativeTo and the steps, a part in the grips", () => {
    const c = copy();
    (c.targets as JsonObject[])[0]!.name = "take";
    // "pick" is named by "above pick".relativeTo and by step 2's `to`: two references.
    expect(renameReferences(c, "target", "pick", "take")).toBe(2);
    expect((c.targets as JsonObject[])[1]!.relativeTo).toBe("take");
    expect((c.cycle as JsonObject[])[1]!.to).toBe("take");
    expect(renameReferences(c, "part", "box", "crate")).toBe(1);
    expect((c.cycle as JsonObject[])[1]!.grip).toBe("crate");
  });

  it("switches a target between an absolute pose and an offset, keeping where it is", () => {
    const c = copy();
    // "place" at (600, 400, 500) as an offset from "pick" at (600, −200, 300): (0, 600, 200).
    switchTargetForm(c, 2, "pick");
    expect((c.targets as JsonObject[])[2]).toEqual({ name: "place", relativeTo: "pick", offsetMm: [0, 600, 200] });
    // "above pick" = pick + (0, 0, 100) = (600, −200, 400), with pick's orientation (180, 0, 0).
    switchTargetForm(c, 1, null);
    expect((c.targets as JsonObject[])[1]).toEqual({
      name: "above pick",
      positionMm: [600, -200, 400],
      rpyDeg: [180, 0, 0],
    });
  });

  it("adds, removes and moves entries; ticks candidates; re-keys, adds and removes per-arm placements", () => {
    const c = copy();
    applyFormChange(c, { kind: "add", list: ["cycle"], entry: { to: "pick", motion: "joint" } });
    expect((c.cycle as JsonObject[]).map((s) => s.to)).toEqual(["above pick", "pick", "place", "pick"]);
    applyFormChange(c, { kind: "move", list: ["cycle"], index: 3, by: -1 });
    expect((c.cycle as JsonObject[]).map((s) => s.to)).toEqual(["above pick", "pick", "pick", "place"]);
    applyFormChange(c, { kind: "remove", list: ["cycle"], index: 2 });
    expect((c.cycle as JsonObject[]).map((s) => s.to)).toEqual(["above pick", "pick", "place"]);
    applyFormChange(c, { kind: "candidate", id: "arm-c", on: true });
    applyFormChange(c, { kind: "candidate", id: "arm-a", on: false });
    expect(c.candidates).toEqual(["arm-b", "arm-c"]);
    applyFormChange(c, { kind: "placement-key", from: "arm-b", to: "arm-c" });
    expect(Object.keys(c.placements as JsonObject)).toEqual(["arm-c"]);
    applyFormChange(c, { kind: "placement-add" });
    // The first candidate without its own placement gets a copy of the cell's.
    expect((c.placements as JsonObject)["arm-b"]).toEqual(CELL.placement);
    applyFormChange(c, { kind: "placement-remove", id: "arm-b" });
    applyFormChange(c, { kind: "placement-remove", id: "arm-c" });
    expect("placements" in c).toBe(false);
  });

  it("drops the speed field of the other kind of move when the motion changes", () => {
    const c = copy();
    applyFormChange(c, { kind: "motion", index: 0, motion: "linear" });
    expect((c.cycle as JsonObject[])[0]).toEqual({ to: "above pick", motion: "linear" });
    applyFormChange(c, { kind: "motion", index: 1, motion: "joint" });
    expect((c.cycle as JsonObject[])[1]).toEqual({ to: "pick", motion: "joint", dwellS: 0.5, grip: "box" });
  });
});

describe("issue placement", () => {
  it("walks a JSON path up one segment at a time", () => {
    expect(parentPath("targets[2].positionMm[0]")).toBe("targets[2].positionMm");
    expect(parentPath("targets[2].positionMm")).toBe("targets[2]");
    expect(parentPath("targets[2]")).toBe("targets");
    expect(parentPath("targets")).toBe("");
    expect(parentPath('placements["arm-a"].rpyDeg')).toBe('placements["arm-a"]');
    expect(parentPath('placements["arm-a"]')).toBe("placements");
  });

  it("puts an issue at the deepest slot at or above its path, else at the top", () => {
    const slots = new Set(["", "targets[2]", "targets[2].positionMm", "cycle"]);
    expect(slotOf("targets[2].positionMm[1]", slots)).toBe("targets[2].positionMm");
    expect(slotOf("targets[2].rpyDeg", slots)).toBe("targets[2]");
    expect(slotOf("cycle[4].to", slots)).toBe("cycle");
    expect(slotOf("tool.tcp", slots)).toBe("");
  });
});

describe("the saved cell file", () => {
  it("puts $schema first and the fields in the format's order, vectors on one line, and parses back to the cell", () => {
    const shuffled: JsonObject = { cycle: CELL.cycle as never, id: CELL.id, ...copy() };
    const text = cellFileText(shuffled);
    expect(text.endsWith("}\n")).toBe(true);
    expect(Object.keys(JSON.parse(text) as object)).toEqual([
      "$schema",
      "id",
      "title",
      "description",
      "candidates",
      "placement",
      "placements",
      "tool",
      "parts",
      "targets",
      "cycle",
      "requirements",
    ]);
    expect(JSON.parse(text)).toEqual({ $schema: CELL_SCHEMA_REF, ...copy() });
    expect(text).toContain('"positionMm": [0, 0, 500]');
  });

  it("starts from a cell the catalog's validation accepts", () => {
    const cell = starterCell(["arm-a", "arm-b"]);
    const r = validateCell(JSON.parse(cellFileText(cell)), "new-cell.json", "new-cell", ["arm-a", "arm-b"]);
    expect(r.issues.filter((i) => i.severity === "error")).toEqual([]);
    expect(r.ok).toBe(true);
  });
});
