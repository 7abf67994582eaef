import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { clearShop, makeDueTool, recalibrate } from "../support/factories-reminders";
import { startMailCatcher, type MailCatcher, type CaughtMessage } from "../../server/dev-services/mail-catcher";
import { smtpMailer } from "../../server/platform/mailer";
import { createDb } from "../../server/db/client";
import { runReminders, type RunOptions } from "../../server/modules/reminders/reminders.service";
import type { RunRemindersResult } from "../../shared/reminders/reminders.schemas";
import { addDays } from "../../shared/common/dates";

// The reminder job against the real local SMTP catcher, with a movable clock:
// tests move time instead of waiting. Lead times 30/7/0 and escalation after 7
// days overdue are the settings' defaults (common practice, no source).

const SHOP_URL = "https://tenthwise.shop.example";
let catcher: MailCatcher;
let t: TestApp;
let waits: number[];

const NOW = "2026-06-15T15:00:00Z"; // 10:00 in the shop (America/Chicago)

beforeAll(async () => {
  catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
  t = await createTestApp({
    now: NOW,
    mailer: smtpMailer(`smtp://127.0.0.1:${catcher.smtpPort}`, "Tenthwise <tenthwise@test.example>"),
    env: { PUBLIC_URL: SHOP_URL, MAIL_CATCHER_URL: `http://127.0.0.1:${catcher.httpPort}` },
  });
});
afterAll(async () => {
  await t?.close();
  await catcher.close();
});
/** One app per file (the session layer is process-wide), so each test arranges its own shop on it. */
async function freshShop() {
  await clearShop(t.db);
  t.clock.set(NOW);
  catcher.clear();
  waits = [];
}

/** The job as the server runs it, except that SMTP retries record their wait instead of waiting. */
function run(hooks?: RunOptions["hooks"], deps: Partial<Parameters<typeof runReminders>[0]> = {}): Promise<RunRemindersResult> {
  return runReminders(
    { ...t.app.deps, retry: { attempts: 3, backoffMs: (n) => 2000 * 4 ** (n - 1), sleep: async (ms) => void waits.push(ms) }, ...deps },
    { trigger: "manual", hooks },
  );
}
const to = (email: string) => catcher.messages().filter((m) => m.to.includes(email));
/** The section headings of a digest: what kind of reminder each block is. */
const headings = (m: CaughtMessage) => m.text.split("\n").filter((l) => l.startsWith("== ")).map((l) => l.replace(/^== (.*) \(\d+\) ==$/, "$1"));
const at = (day: string) => `${day}T15:00:00Z`; // 10:00 in the shop (America/Chicago)

describe("each lead-time stage fires once as a tool comes due", () => {
  beforeEach(freshShop);

  it("a tool due on 15 July reminds the crib 30 days, 7 days and on the day, then quality when it is overdue and again when escalated", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7001", dueAt: "2026-07-15" });
    const seen: string[] = [];
    for (let day = "2026-06-10"; day <= "2026-07-25"; day = addDays(day, 1)) {
      t.clock.set(at(day));
      const before = catcher.messages().length;
      await run();
      for (const m of catcher.messages().slice(before)) seen.push(`${day} ${m.to[0].split("@")[0]}: ${headings(m).join(" + ")}`);
    }
    expect(seen).toEqual([
      "2026-06-15 crib: Calibration due within 30 days",
      "2026-07-08 crib: Calibration due within 7 days",
      "2026-07-15 crib: Calibration runs out today",
      "2026-07-16 crib: Overdue for calibration",
      "2026-07-16 quality: Overdue for calibration",
      "2026-07-22 quality: Escalated to quality",
    ]);
  });

  it("a second run the same morning sends nothing new and counts what was already sent", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7002", dueAt: "2026-06-22", issuedTo: t.people.mechanic.id });
    const first = await run();
    expect(first).toMatchObject({ status: "finished", sent: 2, failed: 0 });
    const second = await run();
    expect(second).toMatchObject({ status: "finished", sent: 0, failed: 0, skipped: 2 });
    expect(catcher.messages()).toHaveLength(2);
  });

  it("a new calibration (a new due date) starts a new cycle of reminders", async () => {
    const { tool } = await makeDueTool(t.db, { assetTag: "MIC-7003", dueAt: "2026-06-22" });
    await run();
    expect(to("crib@test.example").map(headings)).toEqual([["Calibration due within 7 days"]]);
    await recalibrate(t.db, tool.id, "2026-06-18T15:00:00Z", "2027-06-18");
    t.clock.set(at("2027-06-11"));
    await run();
    const crib = to("crib@test.example");
    expect(crib.map(headings)).toEqual([["Calibration due within 7 days"], ["Calibration due within 7 days"]]);
    expect(crib[1].text).toContain("Due: 2027-06-18");
  });

  it("a run whose clock is behind a recorded calibration judges the tool as it stood at the run's instant", async () => {
    // A clock set back (docs/decisions/013): the calibration recorded on 18 June has not happened yet on the 16th, so
    // the tool is still due on 22 June; the register's stored state (due 2027) must not decide the reminder.
    const { tool } = await makeDueTool(t.db, { assetTag: "MIC-7004", dueAt: "2026-06-22" });
    await recalibrate(t.db, tool.id, "2026-06-18T15:00:00Z", "2027-06-18");
    t.clock.set(at("2026-06-16"));
    await run();
    const crib = to("crib@test.example");
    expect(crib.map(headings)).toEqual([["Calibration due within 7 days"]]);
    expect(crib[0].text).toContain("Due: 2026-06-22");
    // With the clock right again, that cycle is over and the new due date is a year away: nothing more to send.
    t.clock.set(at("2026-06-19"));
    expect(await run()).toMatchObject({ status: "finished", sent: 0, failed: 0 });
  });
});

describe("exactly once, even with two instances or a crash", () => {
  beforeEach(freshShop);

  it("two runs started at once send each digest once; the later one reports it found the run lock taken", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7010", dueAt: "2026-06-22", issuedTo: t.people.mechanic.id });
    await makeDueTool(t.db, { assetTag: "MIC-7011", dueAt: "2026-06-10" });
    const admin = await t.agent("admin");
    const [a, b] = await Promise.all([admin.post("/api/admin/jobs/reminders/run"), admin.post("/api/admin/jobs/reminders/run")]);
    expect([a.status, b.status]).toEqual([200, 200]);
    expect(a.body.sent + b.body.sent).toBe(3); // mechanic, crib, quality
    for (const email of ["mechanic@test.example", "crib@test.example", "quality@test.example"]) expect(to(email), email).toHaveLength(1);
  });

  it("a second app instance on the same database that starts while the first is sending sends nothing", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7012", dueAt: "2026-06-22", issuedTo: t.people.mechanic.id });
    const other = createDb(t.database.url, 2);
    let second: RunRemindersResult | undefined;
    const first = await run({ afterClaim: async () => void (second = await run(undefined, { db: other.db, pool: other.pool })) }).finally(() => other.pool.end());
    expect(first).toMatchObject({ status: "finished", sent: 2 });
    expect(second).toMatchObject({ status: "skipped_locked", sent: 0 });
    expect(catcher.messages()).toHaveLength(2);
    const admin = await t.agent("admin");
    expect((await admin.get(`/api/admin/reminder-runs/${second!.runId}`)).body).toMatchObject({ status: "skipped_locked", error: "Another run was already sending reminders." });
  });

  it("a run that dies after the first digest is finished by the next run, and nobody gets a digest twice", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7020", dueAt: "2026-06-22", issuedTo: t.people.mechanic.id });
    await makeDueTool(t.db, { assetTag: "MIC-7021", dueAt: "2026-06-05", issuedTo: t.people.inspector.id });
    await expect(
      run({
        afterSend: (n) => {
          if (n === 1) throw new Error("process killed");
        },
      }),
    ).rejects.toThrow("process killed");
    expect(catcher.messages()).toHaveLength(1);

    const rerun = await run();
    expect(rerun.status).toBe("finished");
    const recipients = catcher.messages().map((m) => m.to[0]).sort();
    expect(recipients).toEqual(["crib@test.example", "inspector@test.example", "mechanic@test.example", "quality@test.example"]);
    expect(await run()).toMatchObject({ sent: 0 });
    expect(catcher.messages()).toHaveLength(4);

    // Earlier tests of this file moved the clock past today and left runs dated later than these: ask
    // for this test's runs by what they are, not by their place on the first page of the list.
    const runs = (await (await t.agent("admin")).get("/api/admin/reminder-runs?pageSize=500")).body.items as { id: string; status: string; error: string | null }[];
    expect(runs.filter((r) => r.status === "failed" && r.error === "process killed")).toHaveLength(1);
    expect(runs.find((r) => r.id === rerun.runId)?.status).toBe("finished");
  });
});

describe("SMTP failures are retried and reported, never dropped", () => {
  beforeEach(freshShop);

  it("a mail server that refuses twice is tried a third time, after waiting longer each time, and the digest arrives", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7030", dueAt: "2026-06-22" });
    catcher.failNext(2);
    const result = await run();
    expect(result).toMatchObject({ sent: 1, failed: 0 });
    expect(to("crib@test.example")).toHaveLength(1);
    expect(waits).toEqual([2000, 8000]);
  });

  it("a digest that cannot be delivered is recorded as failed with the mail server's error, and the next run sends it", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7031", dueAt: "2026-06-22" });
    catcher.failNext(3);
    const failed = await run();
    expect(failed).toMatchObject({ sent: 0, failed: 1 });
    expect(catcher.messages()).toHaveLength(0);
    const admin = await t.agent("admin");
    const detail = (await admin.get(`/api/admin/reminder-runs/${failed.runId}`)).body;
    expect(detail.error).toMatch(/1 digest could not be sent/);
    expect(detail.entries).toEqual([expect.objectContaining({ assetTag: "MIC-7031", status: "failed", attempts: 3, recipientEmail: "crib@test.example" })]);
    expect(detail.entries[0].lastError).toMatch(/451/);

    const next = await run();
    expect(next).toMatchObject({ sent: 1, failed: 0 });
    expect(to("crib@test.example")).toHaveLength(1);
  });
});

describe("what each digest says", () => {
  beforeAll(async () => {
    await freshShop();
    // Issued to the mechanic, due in 7 days.
    await makeDueTool(t.db, { assetTag: "MIC-7101", dueAt: "2026-06-22", description: "Outside micrometer 1-2 in", issuedTo: t.people.mechanic.id });
    // On the crib shelf, overdue for 10 days: escalated.
    await makeDueTool(t.db, { assetTag: "DIA-7102", dueAt: "2026-06-05", description: "Dial indicator 0-1 in", location: "Crib cabinet D" });
    // Overdue by 2 days and still issued to the inspector: escalated at once.
    await makeDueTool(t.db, { assetTag: "SHG-7103", dueAt: "2026-06-13", description: "Small-hole gauge set", issuedTo: t.people.inspector.id, issuedAt: "2026-06-12T13:00:00Z", dueBackAt: "2026-06-12T22:00:00Z" });
    // The mechanic's own micrometer, at home in their box, due in 30 days.
    await makeDueTool(t.db, { assetTag: "MIC-P-7104", dueAt: "2026-07-15", description: "Personal outside micrometer 0-1 in", ownerUserId: t.people.mechanic.id, location: null });
    await run();
  });

  it("the mechanic's digest lists the tool issued to them and their own tool, with due date, where it is, who has it and a link", async () => {
    const mail = to("mechanic@test.example");
    expect(mail).toHaveLength(1);
    const [m] = mail;
    expect(m.subject).toBe("Tool calibration reminders: 2 coming due (Tenthwise shop)");
    expect(headings(m)).toEqual(["Calibration due within 7 days", "Calibration due within 30 days"]);
    expect(m.text).toContain("MIC-7101  Outside micrometer 1-2 in");
    expect(m.text).toContain("Due: 2026-06-22 (in 7 days)");
    expect(m.text).toContain("Has it: Test mechanic (mechanic@test.example), since 2026-06-15 08:00");
    expect(m.text).toContain(`${SHOP_URL}/tools/MIC-7101`);
    expect(m.text).toContain("MIC-P-7104  Personal outside micrometer 0-1 in");
    expect(m.text).toContain("Where: With its owner");
    expect(m.text).toContain("Has it: Test mechanic (owner)");
    expect(m.text).not.toContain("DIA-7102");
    expect(m.html).toContain(`<a href="${SHOP_URL}/tools/MIC-7101">MIC-7101</a>`);
    expect(m.text).toContain("who alone decide airworthiness and return to service");
  });

  it("the crib attendant's digest is everything due in the crib, most urgent first, including a tool not returned at the end of its shift", async () => {
    const [m] = to("crib@test.example");
    expect(headings(m)).toEqual(["Overdue for calibration", "Not returned to the crib", "Calibration due within 7 days", "Calibration due within 30 days"]);
    expect(m.text).toContain("DIA-7102  Dial indicator 0-1 in\n  Due: 2026-06-05 (10 days overdue; do not use until recalibrated)\n  Where: Crib cabinet D\n  Has it: Nobody: not issued");
    expect(m.text).toContain("SHG-7103  Small-hole gauge set\n  Due: 2026-06-13 (was due back 2026-06-12 17:00)");
    expect(m.text).toContain("Has it: Test inspector (inspector@test.example), since 2026-06-12 08:00");
    expect(m.text).toContain("MIC-P-7104");
    expect(m.subject).toBe("Tool calibration reminders: 2 overdue, 1 not returned, 2 coming due (Tenthwise shop)");
  });

  it("quality's digest has the overdue tools and the escalations, and nothing merely coming due", async () => {
    const [m] = to("quality@test.example");
    expect(headings(m)).toEqual(["Escalated to quality", "Overdue for calibration"]);
    const escalated = m.text.split("== Overdue")[0];
    expect(escalated).toContain("DIA-7102  Dial indicator 0-1 in\n  Due: 2026-06-05 (10 days overdue)");
    expect(escalated).toContain("SHG-7103  Small-hole gauge set\n  Due: 2026-06-13 (2 days overdue and still issued)");
    expect(m.text).not.toContain("MIC-7101");
    expect(m.text).not.toContain("MIC-P-7104");
    expect(m.subject).toBe("Tool calibration reminders: 2 escalated, 2 overdue (Tenthwise shop)");
  });

  it("the inspector holding an overdue tool is told it is overdue and was not returned", async () => {
    const [m] = to("inspector@test.example");
    expect(headings(m)).toEqual(["Overdue for calibration", "Not returned to the crib"]);
  });
});

describe("tools due by usage", () => {
  beforeEach(freshShop);

  it("a tool near its usage limit is recalled by usage, and one that reached it goes to quality", async () => {
    await makeDueTool(t.db, { assetTag: "FLR-7201", dueAt: "2027-01-01", description: "Feeler set", usageLimit: 10, usesTaken: 9 });
    await makeDueTool(t.db, { assetTag: "FLR-7202", dueAt: "2027-01-01", description: "Feeler set", usageLimit: 10, usesTaken: 10 });
    await run();
    const [crib] = to("crib@test.example");
    expect(headings(crib)).toEqual(["Usage limit reached", "Few uses left before calibration"]);
    expect(crib.text).toContain("FLR-7201  Feeler set\n  Due: 2027-01-01 (1 use left of 10)");
    const [quality] = to("quality@test.example");
    expect(quality.text).toContain("FLR-7202");
    expect(quality.text).not.toContain("FLR-7201");
  });
});

describe("personal preferences", () => {
  beforeEach(freshShop);

  it("a mechanic who turned off their digest gets none, while the crib still hears about the tool", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7301", dueAt: "2026-06-22", issuedTo: t.people.mechanic.id });
    const mech = await t.agent("mechanic");
    const put = await mech.put("/api/me/notification-preferences", { myTools: false });
    expect(put.status).toBe(200);
    expect(put.body.digests).toEqual([expect.objectContaining({ digest: "myTools", enabled: false, locked: false })]);
    await run();
    expect(to("mechanic@test.example")).toHaveLength(0);
    expect(to("crib@test.example")).toHaveLength(1);
  });

  it("quality who turned off the overdue digest still gets escalations", async () => {
    await makeDueTool(t.db, { assetTag: "MIC-7302", dueAt: "2026-06-01" });
    const q = await t.agent("quality");
    expect((await q.put("/api/me/notification-preferences", { quality: false })).status).toBe(200);
    await run();
    const [m] = to("quality@test.example");
    expect(headings(m)).toEqual(["Escalated to quality"]);
  });
});
