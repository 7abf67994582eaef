import request from "supertest";
import { fixedClock } from "../../server/platform/clock";
import { usersService } from "../../server/modules/users/users.service";
import type { Db } from "../../server/db/client";
import { makeLimitTable, makeToolInCalibration } from "./factories-inspection";
import { makeCalibration, makeFamily, makeTool } from "./factories";
import { TEST_PASSWORD, type TestApp } from "./test-app";

// Factories for gauge-study tests: a characteristic, a tool family with tools in calibration, three mechanics.
let n = 0;
const next = () => `${Date.now().toString(36).slice(-4)}${++n}`.toUpperCase();

/**
 * The AIAG MSA 4th ed. GRR example data, 10 parts × 3 appraisers × 3 trials, as [part][appraiser][trial]
 * (the published example data set; see ../shared/spec/msa-check-values.md, A).
 */
export const AIAG_DATA: number[][][] = [
  [[0.29, 0.41, 0.64], [0.08, 0.25, 0.07], [0.04, -0.11, -0.15]],
  [[-0.56, -0.68, -0.58], [-0.47, -1.22, -0.68], [-1.38, -1.13, -0.96]],
  [[1.34, 1.17, 1.27], [1.19, 0.94, 1.34], [0.88, 1.09, 0.67]],
  [[0.47, 0.5, 0.64], [0.01, 1.03, 0.2], [0.14, 0.2, 0.11]],
  [[-0.8, -0.92, -0.84], [-0.56, -1.2, -1.28], [-1.46, -1.07, -1.45]],
  [[0.02, -0.11, -0.21], [-0.2, 0.22, 0.06], [-0.29, -0.67, -0.49]],
  [[0.59, 0.75, 0.66], [0.47, 0.55, 0.83], [0.02, 0.01, 0.21]],
  [[-0.31, -0.2, -0.17], [-0.63, 0.08, -0.34], [-0.46, -0.56, -0.49]],
  [[2.26, 1.99, 2.01], [1.8, 2.12, 2.19], [1.77, 1.45, 1.87]],
  [[-1.36, -1.25, -1.31], [-1.68, -1.62, -1.5], [-1.49, -1.77, -2.16]],
];

/**
 * An invented characteristic read as a deviation from a setting master (so the example's signed values fit it):
 * limits −3 to +3 (a tolerance of 6 units, test values only), read with dial indicators, plus a pin and a
 * clearance item for the refusals.
 */
export async function makeStudyWorld(db: Db, opts: { now?: string } = {}) {
  const table = await makeLimitTable(db, {
    unit: "mm",
    items: [
      { key: "dev", label: "Pin dia., deviation from master (test)", section: "Piston and pin", kind: "journal", min: -3, max: 3, toolKinds: ["dial_indicator"] },
      { key: "pin", label: "Piston pin dia.", section: "Piston and pin", kind: "journal", min: 22.21, max: 22.225 },
      { key: "pin_bore", label: "Piston pin bore", section: "Piston and pin", kind: "bore", min: 22.23, max: 22.245 },
      { key: "pin_clearance", label: "Pin to piston clearance", section: "Piston and pin", kind: "clearance", boreKey: "pin_bore", journalKey: "pin", min: 0.005, max: 0.035 },
    ],
  });
  const performedAt = new Date(new Date(opts.now ?? "2026-06-15T15:00:00Z").getTime() - 30 * 86_400_000);
  const nextDueAt = new Date(performedAt.getTime() + 330 * 86_400_000).toISOString().slice(0, 10);
  const family = await makeFamily(db, { kind: "dial_indicator", unit: "mm", name: `Dial indicator ±5 mm ${next()}`, mpe: "0.01", resolution: "0.01" });
  const indicators = [];
  for (let i = 0; i < 3; i++) {
    const tool = await makeTool(db, { familyId: family.id, assetTag: `DIA-${next()}`, description: "Dial indicator on a comparator stand", unit: "mm", rangeMin: "-5", rangeMax: "5", resolution: "0.01" });
    await makeCalibration(db, tool.id, { performedAt, nextDueAt });
    indicators.push(tool);
  }
  const overdue = await makeTool(db, { familyId: family.id, assetTag: `DIA-${next()}`, description: "Dial indicator, overdue", unit: "mm", rangeMin: "-5", rangeMax: "5", resolution: "0.01" });
  await makeCalibration(db, overdue.id, { performedAt: new Date(performedAt.getTime() - 400 * 86_400_000), nextDueAt: "2025-12-31" });
  const otherFamilyTool = await makeToolInCalibration(db, { unit: "mm", rangeMin: "0", rangeMax: "25", performedAt: performedAt.toISOString(), nextDueAt });
  return { table, family, indicators, overdue, otherFamilyTool };
}

/** Two more mechanics beside the test app's own, for a three-appraiser study. */
export async function makeMechanics(t: TestApp) {
  const users = usersService({ db: t.db, clock: fixedClock("2026-06-01T12:00:00Z") });
  const a = await users.create({ email: `mech-${next().toLowerCase()}@test.example`, name: "Test mechanic two", role: "mechanic", password: TEST_PASSWORD }, null);
  const b = await users.create({ email: `mech-${next().toLowerCase()}@test.example`, name: "Test mechanic three", role: "mechanic", password: TEST_PASSWORD }, null);
  return [t.people.mechanic, a, b];
}

/** A signed-in session for any person (the test app's `agent` knows one person per role). */
export async function agentFor(t: TestApp, email: string) {
  const a = request.agent(t.app);
  let token = (await a.get("/api/auth/csrf")).body.token as string;
  const res = await a.post("/api/auth/login").set("X-CSRF-Token", token).send({ email, password: TEST_PASSWORD });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status}`);
  token = res.body.csrfToken;
  return {
    get: (url: string) => a.get(url),
    post: (url: string, body?: object) => a.post(url).set("X-CSRF-Token", token).send(body ?? {}),
  };
}
export type StudyAgent = Awaited<ReturnType<typeof agentFor>>;

/** Each appraiser answers every prompt in the order shown, with the value of the data grid for that part and trial. */
export async function takeWholeStudy(studyId: string, appraisers: StudyAgent[], data: number[][][], toolTags: string[]) {
  for (const [j, a] of appraisers.entries()) {
    for (;;) {
      const s = await a.get(`/api/studies/${studyId}/session`);
      if (s.status !== 200) throw new Error(`session: ${s.status} ${JSON.stringify(s.body)}`);
      const p = s.body.prompt;
      if (!p) break;
      const res = await a.post(`/api/studies/${studyId}/values`, { part: p.part, trial: p.trial, value: data[p.part - 1][j][p.trial - 1], toolAssetTags: [toolTags[j]] });
      if (res.status !== 201) throw new Error(`value: ${res.status} ${JSON.stringify(res.body)}`);
    }
  }
}
