import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { z } from "zod";
import { randomUUID } from "node:crypto";
import { createTestApp, type TestAgent, type TestApp } from "../support/test-app";
import { stateDigest } from "../support/state-digest";
import { ROLES, type Role } from "../../shared/auth/roles";
import type { RouteDoc } from "../../server/openapi/registry";

// Every write route the app registers (routes other branches add included: the list comes from the
// OpenAPI registry, the bodies from each route's own zod schema) receives generated bad bodies. Each
// body is checked against the schema here first and kept only if the schema refuses it, so every one
// must be answered 4xx with the documented error shape — never 5xx — and change nothing.

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };
type JsonSchema = { type?: string | string[]; properties?: Record<string, JsonSchema>; required?: string[]; items?: JsonSchema; enum?: Json[]; anyOf?: JsonSchema[]; oneOf?: JsonSchema[]; format?: string; const?: Json; default?: Json };

/** A plausible value for a JSON schema (the starting point that mutations break). */
function sample(s: JsonSchema | undefined, depth = 0): Json {
  if (!s || depth > 6) return "x";
  if (s.const !== undefined) return s.const;
  if (s.enum?.length) return s.enum[0];
  const alt = s.anyOf ?? s.oneOf;
  if (alt?.length) return sample(alt.find((a) => a.type !== "null") ?? alt[0], depth + 1);
  const type = Array.isArray(s.type) ? s.type.find((t) => t !== "null") : s.type;
  switch (type) {
    case "object":
      return Object.fromEntries(Object.entries(s.properties ?? {}).map(([k, v]) => [k, sample(v, depth + 1)]));
    case "array":
      return [sample(s.items, depth + 1)];
    case "number":
      return 0.5;
    case "integer":
      return 1;
    case "boolean":
      return true;
    case "string":
      return s.format === "uuid" ? randomUUID() : s.format === "date-time" ? "2026-06-15T10:00:00-05:00" : s.format === "date" ? "2026-06-15" : "sample";
    default:
      return "sample";
  }
}

/** Values that break a field of any type: wrong types, overflow, NUL, impossible dates, path tricks, sizes. */
const BAD_VALUES: Json[] = [
  null,
  "",
  "a\u0000b",
  true,
  -1,
  0,
  1e308,
  -1e308,
  1e-320,
  "1e308",
  "0001-01-01",
  "9999-99-99",
  "2026-02-30",
  "../../etc/passwd",
  "calibration-certificates/../standard-certificates/x",
  "x".repeat(20_000),
  [],
  [null],
  {},
  { nested: { deeper: "a\u0000b" } },
  "\ud800",
  "NaN",
];

/** Paths to every property of a sample value (objects and the first item of arrays). */
function paths(v: Json, prefix: (string | number)[] = []): (string | number)[][] {
  if (Array.isArray(v)) return v.length ? [[...prefix, 0], ...paths(v[0], [...prefix, 0])] : [];
  if (v && typeof v === "object") return Object.entries(v).flatMap(([k, x]) => [[...prefix, k], ...paths(x, [...prefix, k])]);
  return [];
}

function setAt(v: Json, path: (string | number)[], value: Json | undefined): Json {
  const copy = structuredClone(v);
  let cur = copy as Record<string | number, Json>;
  for (const p of path.slice(0, -1)) cur = cur[p] as Record<string | number, Json>;
  const last = path[path.length - 1];
  if (value === undefined) delete cur[last];
  else cur[last] = value;
  return copy;
}

/** Bad bodies for one route: every field broken every way, fields removed, and wrong top-level shapes. */
function badBodies(schema: z.ZodType): Json[] {
  const js = z.toJSONSchema(schema, { io: "input", unrepresentable: "any" }) as JsonSchema;
  const base = sample(js);
  const candidates: Json[] = [[], "a body", 42, { ...(base as object), "\u0000": 1 } as Json];
  for (const p of paths(base)) {
    for (const bad of BAD_VALUES) candidates.push(setAt(base, p, bad));
    candidates.push(setAt(base, p, undefined));
  }
  // Kept only when the route's own schema refuses it (a schema that throws instead counts as refusing:
  // the server must still answer 4xx).
  return candidates.filter((c) => {
    try {
      return !schema.safeParse(c).success;
    } catch {
      return true;
    }
  });
}

const fill = (path: string) => path.replace(/:([A-Za-z]+)/g, (_m, name: string) => (/id$/i.test(name) ? randomUUID() : "FUZZ-01"));

let t: TestApp;
let agents: Map<Role, TestAgent>;

beforeAll(async () => {
  t = await createTestApp();
  agents = new Map();
  for (const r of ROLES) agents.set(r, await t.agent(r));
});
afterAll(async () => {
  await t?.close();
});

/** At most this many per route, spread over its fields, so a route with many fields does not crowd out the rest. */
const PER_ROUTE = 80;
/** Bodies in flight at once: each is its own request, and all of them are refused. */
const AT_ONCE = 6;
const spread = <T>(xs: T[], n: number) => (xs.length <= n ? xs : Array.from({ length: n }, (_, i) => xs[Math.floor((i * xs.length) / n)]));

describe("every write route refuses bad bodies with 4xx and changes nothing", () => {
  let before: Record<string, string>;
  let sent = 0;
  // The registry is filled when the app is built; build one here only to learn the routes and schemas.
  const routes = (() => {
    const list: (RouteDoc & { body: z.ZodType })[] = [];
    return list;
  })();

  beforeAll(async () => {
    routes.push(...t.app.deps.registry.list().filter((r): r is RouteDoc & { body: z.ZodType } => r.method !== "get" && !!r.body));
    before = await stateDigest(t.db);
  });

  it("every write route with a body schema is exercised", { timeout: 240_000 }, async () => {
    expect(routes.length).toBeGreaterThan(30);
    const problems: string[] = [];
    for (const r of routes) {
      const path = fill(r.path);
      // A role the route lets in: its refusal must then come from the body, not the role guard.
      let agent: TestAgent | undefined;
      for (const role of ROLES) {
        const a = agents.get(role)!;
        const probe = await a[r.method === "delete" ? "delete" : r.method](path, r.method === "delete" ? undefined : ([] as unknown as object));
        if (probe.status !== 403 && probe.status !== 401) {
          agent = a;
          break;
        }
      }
      if (!agent) {
        problems.push(`no role may use ${r.method} ${r.path}`);
        continue;
      }
      const bodies = spread(badBodies(r.body), PER_ROUTE);
      for (let i = 0; i < bodies.length; i += AT_ONCE) {
        await Promise.all(
          bodies.slice(i, i + AT_ONCE).map(async (body) => {
            const res = await agent!.raw[r.method](path).set("X-CSRF-Token", agent!.token()).set("Content-Type", "application/json").send(JSON.stringify(body));
            sent++;
            if (res.status >= 500 || res.status < 400 || typeof res.body?.error?.code !== "string" || typeof res.body?.error?.message !== "string") {
              problems.push(`${r.method.toUpperCase()} ${r.path} ${JSON.stringify(body).slice(0, 160)} → ${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
            }
          }),
        );
      }
    }
    expect(problems.slice(0, 20)).toEqual([]);
  });

  it("at least 2,000 bad bodies were sent, and the shop's data is exactly as before", async () => {
    expect(sent, `${sent} bad bodies sent`).toBeGreaterThanOrEqual(2000);
    expect(await stateDigest(t.db)).toEqual(before);
  });
});
