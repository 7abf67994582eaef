import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

// The layering of style.md, held by a test rather than by habit: shared/ is
// pure, the client never reaches into the server, the server never into the
// client, and a client feature reaches another only through its api/ hooks.
const root = path.resolve(__dirname, "../..");

function files(dir: string): string[] {
  const out: string[] = [];
  for (const e of fs.readdirSync(path.join(root, dir), { withFileTypes: true })) {
    const rel = path.join(dir, e.name);
    if (e.isDirectory()) out.push(...files(rel));
    else if (/\.(ts|tsx)$/.test(e.name)) out.push(rel);
  }
  return out;
}

function imports(file: string): string[] {
  const text = fs.readFileSync(path.join(root, file), "utf8");
  return [...text.matchAll(/(?:import|export)[^'"]*?from\s+["']([^"']+)["']|import\(\s*["']([^"']+)["']\s*\)/g)].map((m) => m[1] ?? m[2]);
}

function resolved(file: string, spec: string): string | null {
  if (!spec.startsWith(".")) return null;
  return path.relative(root, path.resolve(path.dirname(path.join(root, file)), spec));
}

describe("code boundaries", () => {
  it("shared code is pure: no Node, DOM-only, database or server imports", () => {
    const bad: string[] = [];
    for (const f of files("shared")) {
      for (const spec of imports(f)) {
        const r = resolved(f, spec);
        if (spec.startsWith("node:") || ["pg", "express", "drizzle-orm", "react", "fs", "path"].includes(spec) || (r && !r.startsWith("shared"))) bad.push(`${f} → ${spec}`);
      }
    }
    expect(bad).toEqual([]);
  });

  it("the client never imports server or job code", () => {
    const bad = files("src").flatMap((f) => imports(f).filter((s) => /^(server|jobs)\//.test(resolved(f, s) ?? "")).map((s) => `${f} → ${s}`));
    expect(bad).toEqual([]);
  });

  it("the server never imports client code", () => {
    const bad = [...files("server"), ...files("jobs")].flatMap((f) => imports(f).filter((s) => (resolved(f, s) ?? "").startsWith("src/")).map((s) => `${f} → ${s}`));
    expect(bad).toEqual([]);
  });

  it("a client feature uses another feature only through its api/ data hooks, never its components", () => {
    const bad: string[] = [];
    for (const f of files("src/features")) {
      const own = f.split(path.sep)[2];
      for (const s of imports(f)) {
        const r = resolved(f, s);
        const m = r?.match(/^src\/features\/([^/]+)\/(.*)$/);
        if (m && m[1] !== own && !m[2].startsWith("api/")) bad.push(`${f} → ${s}`);
      }
    }
    expect(bad).toEqual([]);
  });
});
