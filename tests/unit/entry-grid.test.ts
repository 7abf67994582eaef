import { describe, expect, it } from "vitest";
import {
  cellState,
  completeValues,
  draftEvidence,
  draftStorageKey,
  emptyDrafts,
  entryRows,
  firstEmpty,
  moveFrom,
  openCells,
  parseEntry,
  readDrafts,
  readyToSave,
  takeInHand,
  toolsForRow,
  withCell,
  withOutcome,
  withoutSaved,
  writeDrafts,
  type GridItem,
  type ToolBox,
} from "../../src/features/jobs/lib/entry-grid";

// The entry grid's keyboard, gauge-input, tool and draft rules (common practice of a keyboard data-entry grid and of
// gauges that send "value + Enter" over a data cable; no published source). The judging is shared and tested in
// shared/inspection/judging.test.ts.

const items: GridItem[] = [
  { key: "barrel_visual", label: "Barrel visual", kind: "visual", section: "Cylinder", directions: 2, repeat: 2 },
  { key: "pin", label: "Piston pin dia.", kind: "journal", section: "Piston and pin", directions: 2, repeat: 2, toolKinds: ["outside_micrometer"] },
  { key: "pin_bore", label: "Piston pin bore", kind: "bore", section: "Piston and pin", directions: 2, repeat: 2, toolKinds: ["telescoping_gauge", "small_hole_gauge"] },
  { key: "pin_clearance", label: "Pin clearance", kind: "clearance", section: "Piston and pin", directions: 2, repeat: 2 },
];
const rows = entryRows(items);
const all = openCells(rows, () => true);

class MemoryStorage {
  data = new Map<string, string>();
  getItem = (k: string) => this.data.get(k) ?? null;
  setItem = (k: string, v: string) => void this.data.set(k, v);
  removeItem = (k: string) => void this.data.delete(k);
}

const mic = { tag: "MIC-0101", kind: "outside_micrometer", unit: "in" as const };
const tel = { tag: "TEL-0101", kind: "telescoping_gauge", unit: "in" as const };

describe("the places of the entry grid", () => {
  it("has a row for each journal and bore on the engine, in the sheet's order; clearances, visual and feeler checks are not typed in it", () => {
    expect(rows.map((r) => r.slot)).toEqual(["pin#1", "pin#2", "pin_bore#1", "pin_bore#2"]);
    expect(all).toHaveLength(8);
  });
});

describe("moving through the grid by keyboard", () => {
  it("Enter or Tab goes to the next direction, then to the first direction of the next place", () => {
    expect(moveFrom(all, { slot: "pin#1", direction: 1 }, "next")).toEqual({ slot: "pin#1", direction: 2 });
    expect(moveFrom(all, { slot: "pin#1", direction: 2 }, "next")).toEqual({ slot: "pin#2", direction: 1 });
    expect(moveFrom(all, { slot: "pin_bore#2", direction: 2 }, "next")).toBeNull();
    expect(moveFrom(all, { slot: "pin#2", direction: 1 }, "previous")).toEqual({ slot: "pin#1", direction: 2 });
  });

  it("skips places already saved, and arrows keep the direction while changing place", () => {
    const open = openCells(rows, (slot) => slot !== "pin#2");
    expect(moveFrom(open, { slot: "pin#1", direction: 2 }, "next")).toEqual({ slot: "pin_bore#1", direction: 1 });
    expect(moveFrom(open, { slot: "pin#1", direction: 2 }, "down")).toEqual({ slot: "pin_bore#1", direction: 2 });
    expect(moveFrom(open, { slot: "pin_bore#1", direction: 1 }, "up")).toEqual({ slot: "pin#1", direction: 1 });
    expect(moveFrom(open, { slot: "pin#1", direction: 1 }, "up")).toBeNull();
  });

  it("the cursor starts at the first cell with nothing in it", () => {
    const d = withCell(withCell(emptyDrafts(), rows[0], 1, "0.8749", { tags: ["MIC-0101"], unit: "in" }), rows[0], 2, "0.8748", { tags: ["MIC-0101"], unit: "in" });
    expect(firstEmpty(all, (c) => d.rows[c.slot]?.values[c.direction - 1] ?? "")).toEqual({ slot: "pin#2", direction: 1 });
  });
});

describe("a value typed or sent by a gauge", () => {
  it("reads the forms gauges send: signed, zero-padded, with a unit or a decimal comma, keeping the digits as sent", () => {
    expect(parseEntry("0.8749", "in")).toEqual({ kind: "value", value: 0.8749, text: "0.8749" });
    expect(parseEntry("+000.87490\r", "in")).toEqual({ kind: "value", value: 0.8749, text: "0.87490" });
    expect(parseEntry(".8749", "in")).toEqual({ kind: "value", value: 0.8749, text: "0.8749" });
    expect(parseEntry("22,225 mm", "mm")).toEqual({ kind: "value", value: 22.225, text: "22.225" });
    expect(parseEntry('0.8749"', "in")).toMatchObject({ kind: "value", value: 0.8749 });
  });

  it("says plainly what is wrong instead of keeping it", () => {
    expect(parseEntry("0.87.49", "in")).toEqual({ kind: "error", message: '"0.87.49" is not a number.' });
    expect(parseEntry("22.225 mm", "in")).toEqual({ kind: "error", message: "The value came in mm, but the tool in hand reads in in." });
    expect(parseEntry("-0.0012", "in")).toEqual({ kind: "error", message: "A diameter is more than zero." });
    expect(parseEntry("   ", "in")).toEqual({ kind: "empty" });
  });

  it("takes a tool's tag scanned into a cell as a change of the tool in hand", () => {
    expect(parseEntry("mic-0104", "in")).toEqual({ kind: "tag", tag: "MIC-0104" });
    expect(parseEntry("abc def", "in")).toEqual({ kind: "error", message: '"abc def" is neither a number nor a tool\'s tag.' });
  });
});

describe("the tool in hand", () => {
  const box = (b: Partial<ToolBox>): ToolBox => ({ reader: null, transfer: null, ...b });
  it("a journal is read on the micrometer in hand", () => {
    expect(toolsForRow(rows[0], box({ reader: mic, transfer: tel }))).toEqual({ tags: ["MIC-0101"], unit: "in" });
  });

  it("a bore names the telescoping gauge and the micrometer that read it", () => {
    expect(toolsForRow(rows[2], box({ reader: mic, transfer: tel }))).toEqual({ tags: ["TEL-0101", "MIC-0101"], unit: "in" });
    expect(toolsForRow(rows[2], box({ reader: mic }))).toEqual({ problem: "Piston pin bore is read through a telescoping gauge or small hole gauge: scan it too." });
    expect(toolsForRow(rows[2], box({ transfer: tel }))).toEqual({ problem: "Scan the micrometer that reads TEL-0101." });
  });

  it("a tool of the wrong kind for the item is refused before anything is typed", () => {
    expect(toolsForRow(rows[0], box({ reader: { tag: "IMC-1", kind: "inside_micrometer", unit: "in" } }))).toEqual({
      problem: "Piston pin dia. is measured with: outside micrometer. IMC-1 is an inside micrometer.",
    });
    expect(toolsForRow(rows[0], box({}))).toEqual({ problem: "Scan the tool in hand first." });
  });

  it("an unusable tool is refused with its reason; a usable one goes to its slot", () => {
    const base = { assetTag: "MIC-0110", kind: "outside_micrometer", unit: "in" as const, acceptanceUse: true, status: "overdue", statusLabel: "Overdue", usableForAcceptance: false, reasons: ["Calibration ran out on 2026-11-20; do not use until recalibrated."] };
    expect(takeInHand(base)).toEqual({ refusal: "MIC-0110 may not be used for readings: Calibration ran out on 2026-11-20; do not use until recalibrated." });
    expect(takeInHand({ ...base, status: "reference_only", statusLabel: "Reference only", reasons: [], usableForAcceptance: true, acceptanceUse: false })).toEqual({
      refusal: "MIC-0110 may not be used for readings: This tool is not for acceptance readings.",
    });
    expect(takeInHand({ ...base, assetTag: "TEL-0101", kind: "telescoping_gauge", status: "in_calibration", usableForAcceptance: true, reasons: [] })).toEqual({ slot: "transfer", tool: tel });
    expect(takeInHand({ ...base, assetTag: "FLR-1", kind: "feeler_set", usableForAcceptance: true, reasons: [] })).toEqual({ refusal: "FLR-1: Feeler checks are entered with the form of each place below." });
  });
});

describe("drafts kept until saved", () => {
  const key = draftStorageKey("job-1", "user-1");
  const inHand = { tags: ["MIC-0101"], unit: "in" as const };

  it("survive a reload of the page: what is written is read back, per sheet and person", () => {
    const storage = new MemoryStorage();
    let d = withCell(emptyDrafts(), rows[0], 1, "0.8749", inHand);
    d = { ...d, box: { reader: mic, transfer: null } };
    writeDrafts(storage, key, d);
    expect(readDrafts(storage, key)).toEqual(d);
    expect(readDrafts(storage, draftStorageKey("job-1", "user-2"))).toEqual(emptyDrafts());
  });

  it("anything unreadable in the browser's store counts as no drafts", () => {
    const storage = new MemoryStorage();
    storage.setItem(key, "{not json");
    expect(readDrafts(storage, key)).toEqual(emptyDrafts());
    storage.setItem(key, JSON.stringify({ version: 1, rows: { "pin#1": { values: [1] } } }));
    expect(readDrafts(storage, key)).toEqual(emptyDrafts());
  });

  it("a place with every cell cleared is no longer a draft, and an empty sheet leaves nothing in the store", () => {
    const storage = new MemoryStorage();
    let d = withCell(emptyDrafts(), rows[0], 1, "0.8749", inHand);
    d = withCell(d, rows[0], 1, "", inHand);
    expect(d.rows).toEqual({});
    writeDrafts(storage, key, d);
    expect(storage.data.size).toBe(0);
  });

  it("each cell says whether it is saved, a draft, refused or empty", () => {
    let d = withCell(emptyDrafts(), rows[0], 1, "0.8749", inHand);
    expect(cellState(false, d.rows["pin#1"], 1)).toBe("draft");
    expect(cellState(false, d.rows["pin#1"], 2)).toBe("empty");
    d = withOutcome(d, "pin#1", { refusal: "MIC-0101 may not be used now" });
    expect(cellState(false, d.rows["pin#1"], 1)).toBe("refused");
    d = withOutcome(d, "pin#1", { savedId: "r-1" });
    expect(cellState(false, d.rows["pin#1"], 1)).toBe("saved");
    expect(cellState(true, undefined, 2)).toBe("saved");
  });

  it("only complete places are saved, one reading per place, and a recorded draft goes once the sheet shows it", () => {
    let d = withCell(emptyDrafts(), rows[0], 1, "0.8749", inHand);
    d = withCell(d, rows[0], 2, "0.8748", inHand);
    d = withCell(d, rows[1], 1, "0.8747", inHand);
    expect(readyToSave(rows, d, () => false).map((r) => r.slot)).toEqual(["pin#1"]);
    expect(completeValues(rows[0], d.rows["pin#1"])).toEqual([0.8749, 0.8748]);
    expect(draftEvidence(rows[0], d.rows["pin#1"])).toEqual({ itemKey: "pin", index: 1, unit: "in", values: [0.8749, 0.8748] });
    expect(draftEvidence(rows[1], d.rows["pin#2"])).toBeNull();
    d = withOutcome(d, "pin#1", { savedId: "r-1" });
    expect(readyToSave(rows, d, () => false)).toEqual([]);
    // A draft never saved stays even when someone else's reading is on the sheet: it is shown, not silently dropped.
    d = withoutSaved(d, new Set(["pin#1", "pin#2"]));
    expect(Object.keys(d.rows)).toEqual(["pin#2"]);
  });

  it("the tools recorded with a place are those in hand when its values were typed", () => {
    let d = withCell(emptyDrafts(), rows[2], 1, "0.8755", { tags: ["TEL-0101", "MIC-0101"], unit: "in" });
    d = withCell(d, rows[2], 2, "0.8756", null);
    expect(d.rows["pin_bore#1"].tools).toEqual(["TEL-0101", "MIC-0101"]);
  });
});
