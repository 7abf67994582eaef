import { describe, expect, it } from "vitest";
import fs from "node:fs";
import path from "node:path";
import ts from "typescript";

// Inside `x.transaction(async (tx) => { … })` every statement must use `tx`. This reads every server and
// job source file and fails on a callback that names the handle the transaction was opened on (`db`,
// `deps.db`, `this.db` …) — the mistake that froze the pool under a burst of releases. (Indirect uses,
// through a helper that closes over `db`, are caught at run time: the pool refuses to be used while a
// transaction is open in the same async context — see server/db/client.ts and tests/api/bursts.)

function sources(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) return sources(p);
    return /\.ts$/.test(e.name) && !/\.test\.ts$/.test(e.name) ? [p] : [];
  });
}

/** Every use of the outer handle inside a transaction callback, as "file:line: text". */
export function outerHandleUses(file: string, text: string): string[] {
  const sf = ts.createSourceFile(file, text, ts.ScriptTarget.ES2022, true);
  const found: string[] = [];
  const visit = (node: ts.Node) => {
    if (ts.isCallExpression(node) && ts.isPropertyAccessExpression(node.expression) && node.expression.name.text === "transaction") {
      const handle = node.expression.expression.getText(sf);
      const callback = node.arguments[0];
      if (callback && (ts.isArrowFunction(callback) || ts.isFunctionExpression(callback))) {
        const inner = (n: ts.Node) => {
          if ((ts.isIdentifier(n) || ts.isPropertyAccessExpression(n)) && n.getText(sf) === handle) {
            // `db` as a property name (`{ db: tx }`, `deps.db` when the handle is plain `db`) is not a use.
            const parent = n.parent;
            const isName = parent && ((ts.isPropertyAccessExpression(parent) && parent.name === n) || (ts.isPropertyAssignment(parent) && parent.name === n));
            if (!isName) {
              const { line } = sf.getLineAndCharacterOfPosition(n.getStart(sf));
              found.push(`${file}:${line + 1}: ${n.parent.getText(sf).slice(0, 120)}`);
            }
          }
          ts.forEachChild(n, inner);
        };
        inner(callback.body);
      }
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return found;
}

describe("one connection per transaction", () => {
  it("no transaction callback in the server or the jobs uses the handle the transaction was opened on", () => {
    const files = [...sources("server"), ...sources("jobs")];
    expect(files.length).toBeGreaterThan(50);
    const uses = files.flatMap((f) => outerHandleUses(f, fs.readFileSync(f, "utf8")));
    expect(uses).toEqual([]);
  });

  it("the check recognises the mistake it is there for", () => {
    const bad = `async function release(db) { await db.transaction(async (tx) => { const v = await statusOf(db, id); await releaseHold(tx, id); }); }`;
    const good = `async function release(db) { await db.transaction(async (tx) => { const v = await statusOf(tx, id); await make({ db: tx }); }); }`;
    const deps = `async function f(deps) { await deps.db.transaction(async (tx) => { await deps.db.select(); }); }`;
    expect(outerHandleUses("bad.ts", bad)).toHaveLength(1);
    expect(outerHandleUses("good.ts", good)).toEqual([]);
    expect(outerHandleUses("deps.ts", deps)).toHaveLength(1);
  });
});
