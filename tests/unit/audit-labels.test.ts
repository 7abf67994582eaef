import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { AUDIT_ACTION_LABELS, AUDIT_RECORD_TYPE_LABELS, auditActionLabel, auditRecordTypeLabel } from "../../shared/audit/labels";
import { LIFECYCLES } from "../../shared/tools/tools.schemas";

// Every audit line the server writes reaches people through the trail: each action and record type needs words.
const root = path.resolve(__dirname, "../..");

function files(dir: string): string[] {
  const out: string[] = [];
  for (const e of fs.readdirSync(path.join(root, dir), { withFileTypes: true })) {
    const rel = path.join(dir, e.name);
    if (e.isDirectory()) out.push(...files(rel));
    else if (/\.ts$/.test(e.name) && !e.name.endsWith(".test.ts")) out.push(rel);
  }
  return out;
}

/** The files that write audit lines, with their text (the audit module itself only defines the writer). */
const writers = [...files("server"), ...files("jobs")]
  .filter((f) => !f.startsWith(path.join("server", "modules", "audit")))
  .map((f) => ({ f, text: fs.readFileSync(path.join(root, f), "utf8") }))
  .filter((x) => /recordAudit(Many)?\(/.test(x.text));

/** The value expressions of `key:` in those files, up to the end of the property. */
function values(key: string): { f: string; expr: string }[] {
  return writers.flatMap(({ f, text }) => [...text.matchAll(new RegExp(`\\b${key}:\\s*([^,\\n}]+)`, "g"))].map((m) => ({ f, expr: m[1] })));
}

const literals = (expr: string) => [...expr.matchAll(/"([^"]+)"/g)].map((m) => m[1]);

describe("the audit trail speaks the shop's words", () => {
  it("finds the writers (the scan is not empty)", () => {
    expect(writers.length).toBeGreaterThan(15);
  });

  it("every action the server writes has a label", () => {
    const written = new Set<string>();
    for (const { f, expr } of values("action")) {
      for (const a of literals(expr).filter((s) => /^[a-z_]+(\.[a-z_]+)+$/.test(s))) written.add(a);
      // A lifecycle move writes tool.lifecycle.<state>: every state it can move to.
      if (expr.includes("`tool.lifecycle.${")) for (const l of LIFECYCLES) written.add(`tool.lifecycle.${l}`);
      else if (expr.startsWith("`")) throw new Error(`${f}: an action built from a template (${expr}) this test cannot list`);
    }
    expect(written.size).toBeGreaterThan(40);
    const missing = [...written].filter((a) => !(a in AUDIT_ACTION_LABELS));
    expect(missing, "actions without a label in shared/audit/labels.ts").toEqual([]);
  });

  it("every record type the server writes has a label", () => {
    const written = new Set(values("entityType").flatMap(({ expr }) => literals(expr)).filter((s) => /^[a-z_]+$/.test(s)));
    expect(written.size).toBeGreaterThan(15);
    const missing = [...written].filter((t) => !(t in AUDIT_RECORD_TYPE_LABELS));
    expect(missing, "record types without a label in shared/audit/labels.ts").toEqual([]);
  });

  it("labels read as words, one per code, never the code itself", () => {
    expect(auditActionLabel("tool.lifecycle.lost")).toBe("Tool reported lost");
    expect(auditActionLabel("investigation.disposition")).toBe("Disposition recorded");
    expect(auditRecordTypeLabel("intermediate_check")).toBe("Intermediate check");
    expect(auditRecordTypeLabel("tool_hold")).toBe("Quarantine hold");
    for (const [code, label] of [...Object.entries(AUDIT_ACTION_LABELS), ...Object.entries(AUDIT_RECORD_TYPE_LABELS)]) {
      expect(label).not.toMatch(/[._]/);
      expect(label).not.toBe(code);
    }
    expect(new Set(Object.values(AUDIT_ACTION_LABELS)).size).toBe(Object.keys(AUDIT_ACTION_LABELS).length);
    // A code from an older release still reads as words.
    expect(auditActionLabel("tool.label_printed")).toBe("Tool label printed");
  });
});
