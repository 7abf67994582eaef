import { afterAll, beforeAll, describe } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { makeFamily, makeTool } from "../support/factories";
import { roleMatrix } from "../support/role-matrix";
import { ROLES } from "../../shared/auth/roles";

let t: TestApp;
let familyId: string;
let assetTag: string;
let familyName: string;
let n = 0;
beforeAll(async () => {
  t = await createTestApp({ now: "2026-06-15T15:00:00Z" });
  const fam = await makeFamily(t.db, { defaultIntervalDays: 365 });
  familyId = fam.id;
  familyName = fam.name;
  assetTag = (await makeTool(t.db, { familyId })).assetTag;
});
afterAll(() => t.close());

const everyone = ROLES;
const csv = () => `Asset tag,Family,Description,Serial,Unit,Min,Max,Resolution\nROLE-${++n},${familyName},Outside micrometer,SN-${n},in,0,1,0.0001\n`;

// Auditors read everything and change nothing; only quality and admin apply intervals or import.
describe("who may use the quality overview", () => {
  roleMatrix(() => t, [
    { method: "get", path: "/api/stats/overview", allowed: everyone },
    { method: "get", path: "/api/stats/dashboard", allowed: everyone },
    { method: "get", path: "/api/stats/mine", allowed: everyone },
    { method: "get", path: "/api/stats/inspection", allowed: everyone },
    { method: "get", path: "/api/intervals/families", allowed: ["quality", "auditor", "admin"] },
    { method: "get", path: () => `/api/families/${familyId}/interval-analysis`, label: "/api/families/:id/interval-analysis", allowed: ["quality", "auditor", "admin"] },
    {
      method: "post",
      path: () => `/api/families/${familyId}/interval-decisions`,
      label: "/api/families/:id/interval-decisions",
      body: () => ({ newIntervalDays: 300 - ++n, rationale: "Shortened after review of the family's history." }),
      allowed: ["quality", "admin"],
    },
    { method: "get", path: () => `/api/tools/${assetTag}/drift`, label: "/api/tools/:assetTag/drift", allowed: everyone },
    { method: "post", path: "/api/imports/dry-run", body: () => ({ csv: csv() }), allowed: ["quality", "admin"] },
    { method: "post", path: "/api/imports/commit", body: () => ({ csv: csv() }), allowed: ["quality", "admin"] },
    { method: "get", path: "/api/exports/register.csv", allowed: everyone },
    { method: "get", path: "/api/exports/history.csv", allowed: everyone },
    { method: "get", path: "/api/audit", allowed: ["quality", "auditor", "admin"] },
    { method: "get", path: "/api/audit/facets", allowed: ["quality", "auditor", "admin"] },
  ]);
});
