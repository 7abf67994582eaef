import { expect, it } from "vitest";
import { ROLES, type Role } from "../../shared/auth/roles";
import type { TestAgent, TestApp } from "./test-app";

export interface MatrixCase {
  method: "get" | "post" | "put" | "patch" | "delete";
  path: string | ((t: TestApp) => string | Promise<string>);
  /** How the route reads in the test name when path is a function, e.g. "/api/tools/:assetTag". */
  label?: string;
  /** A body that would be accepted (or refused only by a trade rule) for an allowed role. */
  body?: object | ((t: TestApp) => object | Promise<object>);
  /** Roles that may; every other role gets 403, and nobody signed out gets through (401). */
  allowed: readonly Role[];
}

/**
 * Every route × every role: allowed roles are not refused for their role
 * (any answer but 401/403), others get 403, a signed-out caller gets 401.
 */
export function roleMatrix(getApp: () => TestApp, cases: MatrixCase[]) {
  for (const c of cases) {
    const label = c.label ?? (typeof c.path === "string" ? c.path : "route");
    it(`${c.method.toUpperCase()} ${label}: only ${c.allowed.join(", ") || "nobody"} may`, async () => {
      const t = getApp();
      const path = typeof c.path === "function" ? await c.path(t) : c.path;
      const body = typeof c.body === "function" ? await c.body(t) : c.body;
      const anonymous = await t.agent();
      const anon = await send(anonymous, c.method, path, body);
      expect(anon.status, `signed out → 401 on ${path}`).toBe(401);
      for (const role of ROLES) {
        const a = await t.agent(role);
        const res = await send(a, c.method, path, body);
        if (c.allowed.includes(role)) expect([401, 403], `${role} should be allowed on ${c.method} ${path}: ${JSON.stringify(res.body)}`).not.toContain(res.status);
        else expect(res.status, `${role} should be refused on ${c.method} ${path}`).toBe(403);
      }
    });
  }
}

function send(a: TestAgent, method: MatrixCase["method"], path: string, body?: object) {
  if (method === "get") return a.get(path);
  if (method === "delete") return a.delete(path);
  return a[method](path, body ?? {});
}
