import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestApp, type TestApp } from "../support/test-app";
import { roleMatrix } from "../support/role-matrix";
import { makeDueTool } from "../support/factories-reminders";
import { startMailCatcher, type MailCatcher } from "../../server/dev-services/mail-catcher";
import { smtpMailer } from "../../server/platform/mailer";
import { runReminders } from "../../server/modules/reminders/reminders.service";
import { startReminderSchedule } from "../../jobs/reminder-schedule";
import { ROLES } from "../../shared/auth/roles";

// The admin's side of reminders (run now, runs, outbox), everyone's
// notification preferences, the schedule, and the settings it reads.

let catcher: MailCatcher;
let t: TestApp;

beforeAll(async () => {
  catcher = await startMailCatcher({ smtpPort: 0, httpPort: 0 });
  t = await createTestApp({
    now: "2026-06-15T15:00:00Z",
    mailer: smtpMailer(`smtp://127.0.0.1:${catcher.smtpPort}`, "Tenthwise <tenthwise@test.example>"),
    env: { MAIL_CATCHER_URL: `http://127.0.0.1:${catcher.httpPort}` },
  });
  await makeDueTool(t.db, { assetTag: "MIC-8001", dueAt: "2026-06-22", issuedTo: t.people.mechanic.id });
});
afterAll(async () => {
  await t?.close();
  await catcher.close();
});

describe("running reminders now and seeing what happened", () => {
  it("an admin runs the reminder job now, sees how many e-mails went out, and finds the run in the list", async () => {
    const admin = await t.agent("admin");
    const res = await admin.post("/api/admin/jobs/reminders/run");
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ sent: 2, failed: 0, status: "finished" });
    const runs = await admin.get("/api/admin/reminder-runs?page=1&pageSize=10");
    expect(runs.status).toBe(200);
    expect(runs.body.items[0]).toMatchObject({ id: res.body.runId, trigger: "manual", status: "finished", sent: 2, failed: 0 });
    const detail = await admin.get(`/api/admin/reminder-runs/${res.body.runId}`);
    expect(detail.body.entries.map((e: { recipientEmail: string; assetTag: string; status: string }) => `${e.recipientEmail} ${e.assetTag} ${e.status}`).sort()).toEqual([
      "crib@test.example MIC-8001 sent",
      "mechanic@test.example MIC-8001 sent",
    ]);
  });

  it("the outbox lists the caught mail newest first as to, subject and sent at, and opens a message's text", async () => {
    const admin = await t.agent("admin");
    const res = await admin.get("/api/admin/outbox");
    expect(res.status).toBe(200);
    expect(res.body.length).toBeGreaterThanOrEqual(2);
    for (const m of res.body) expect(Object.keys(m).sort()).toEqual(["id", "sentAt", "subject", "to"]);
    expect(res.body.map((m: { to: string }) => m.to)).toEqual(expect.arrayContaining(["crib@test.example", "mechanic@test.example"]));
    expect(Date.parse(res.body[0].sentAt)).toBeGreaterThanOrEqual(Date.parse(res.body[res.body.length - 1].sentAt));
    const one = res.body.find((m: { to: string }) => m.to === "mechanic@test.example");
    const open = await admin.get(`/api/admin/outbox/${one.id}`);
    expect(open.status).toBe(200);
    expect(open.body.text).toContain("MIC-8001");
    expect(open.body.html).toContain("MIC-8001");
  });

  it("a run or message that does not exist is a 404, and a malformed id a 400, never a server error", async () => {
    const admin = await t.agent("admin");
    expect((await admin.get("/api/admin/reminder-runs/not-a-uuid")).status).toBe(400);
    const missing = await admin.get("/api/admin/reminder-runs/00000000-0000-4000-8000-000000000000");
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe("reminder_run_not_found");
    expect((await admin.get("/api/admin/outbox/abc")).status).toBe(400);
    expect((await admin.get("/api/admin/outbox/99999")).status).toBe(404);
    expect((await admin.get("/api/admin/reminder-runs?pageSize=0")).status).toBe(400);
  });
});

describe("my notification preferences", () => {
  it("everyone sees the digests their role receives, all on until turned off; quality's escalations are locked on", async () => {
    const digestsOf = async (role: (typeof ROLES)[number]) => (await (await t.agent(role)).get("/api/me/notification-preferences")).body.digests as { digest: string; enabled: boolean; locked: boolean }[];
    expect((await digestsOf("mechanic")).map((d) => d.digest)).toEqual(["myTools"]);
    expect((await digestsOf("crib")).map((d) => d.digest)).toEqual(["myTools", "crib"]);
    const quality = await digestsOf("quality");
    expect(quality.map((d) => [d.digest, d.enabled, d.locked])).toEqual([
      ["myTools", true, false],
      ["quality", true, false],
      ["escalations", true, true],
    ]);
  });

  it("escalations cannot be turned off", async () => {
    const q = await t.agent("quality");
    const res = await q.put("/api/me/notification-preferences", { quality: false, escalations: false });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("escalations_always_on");
    const after = (await q.get("/api/me/notification-preferences")).body.digests;
    expect(after.find((d: { digest: string }) => d.digest === "quality").enabled).toBe(true);
  });

  it("a mechanic cannot sign up for the crib's recall list", async () => {
    const res = await (await t.agent("mechanic")).put("/api/me/notification-preferences", { crib: true });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("digest_not_for_role");
  });

  it("a preference that is not yes or no, or not a digest at all, is refused and nothing is saved", async () => {
    const crib = await t.agent("crib");
    const bad = await crib.put("/api/me/notification-preferences", { crib: "no" });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toEqual(["crib"]);
    expect((await crib.put("/api/me/notification-preferences", { newsletter: false })).status).toBe(400);
    const digests = (await crib.get("/api/me/notification-preferences")).body.digests;
    expect(digests.every((d: { enabled: boolean }) => d.enabled)).toBe(true);
  });

  it("turning a digest off and on again is kept and recorded in the audit trail", async () => {
    const crib = await t.agent("crib");
    expect((await crib.put("/api/me/notification-preferences", { crib: false })).body.digests.find((d: { digest: string }) => d.digest === "crib").enabled).toBe(false);
    expect((await crib.put("/api/me/notification-preferences", { crib: true })).body.digests.find((d: { digest: string }) => d.digest === "crib").enabled).toBe(true);
    const audit = await t.db.query.auditEvents.findMany({ where: (a, { eq }) => eq(a.action, "notification_preferences.update") });
    expect(audit.filter((a) => a.actorId === t.people.crib.id)).toHaveLength(2);
  });
});

describe("the reminder schedule and its settings", () => {
  const localTime = (d: Date, timeZone: string) =>
    new Intl.DateTimeFormat("en-GB", { timeZone, weekday: "short", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(d);

  it("runs daily at 06:00 shop time by default, and follows a new schedule and time zone without a restart", async () => {
    const schedule = await startReminderSchedule(t.app.deps, { pollMs: 3_600_000 });
    try {
      expect(schedule.current()).toEqual({ cron: "0 6 * * *", timeZone: "America/Chicago" });
      expect(localTime(schedule.nextRun()!, "America/Chicago")).toMatch(/ 06:00$/);

      const admin = await t.agent("admin");
      const patched = await admin.patch("/api/settings", { reminderCron: "30 5 * * 1-5", shopTimeZone: "Europe/Oslo" });
      expect(patched.status).toBe(200);
      expect(await schedule.refresh()).toEqual({ cron: "30 5 * * 1-5", timeZone: "Europe/Oslo" });
      expect(localTime(schedule.nextRun()!, "Europe/Oslo")).toMatch(/^(Mon|Tue|Wed|Thu|Fri) 05:30$/);
    } finally {
      await schedule.stop();
      await (await t.agent("admin")).patch("/api/settings", { reminderCron: "0 6 * * *", shopTimeZone: "America/Chicago" });
    }
  });

  it("a schedule that is not a cron expression is refused with an example, and the old one is kept", async () => {
    const admin = await t.agent("admin");
    const res = await admin.patch("/api/settings", { reminderCron: "every day at six" });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_cron");
    expect(res.body.error.message).toContain('"0 6 * * *"');
    const tooMany = await admin.patch("/api/settings", { reminderCron: "0 99 * * *" });
    expect(tooMany.status).toBe(400);
    expect((await admin.get("/api/settings")).body.reminderCron).toBe("0 6 * * *");
  });

  it("an unknown time zone is refused with an example of a real one", async () => {
    const admin = await t.agent("admin");
    const res = await admin.patch("/api/settings", { shopTimeZone: "Mars/Olympus_Mons" });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_time_zone");
    expect(res.body.error.message).toContain("America/Chicago");
    expect((await admin.get("/api/settings")).body.shopTimeZone).toBe("America/Chicago");
  });

  it("reminder stages must be a list of whole days between 0 and 365, and a bad list changes nothing", async () => {
    const admin = await t.agent("admin");
    for (const reminderStages of [[], [-1], [30, 7.5], [400], ["seven"], "30,7,0"]) {
      const res = await admin.patch("/api/settings", { reminderStages });
      expect(res.status, JSON.stringify(reminderStages)).toBe(400);
      expect(res.body.error.code).toBe("invalid_input");
      expect(res.body.error.details[0].path[0]).toBe("reminderStages");
    }
    expect((await admin.get("/api/settings")).body.reminderStages).toEqual([30, 7, 0]);
    const ok = await admin.patch("/api/settings", { reminderStages: [60, 14, 1] });
    expect(ok.body.reminderStages).toEqual([60, 14, 1]);
    await admin.patch("/api/settings", { reminderStages: [30, 7, 0] });
  });
});

describe("who may run reminders, read the outbox and set preferences", () => {
  const everyone = ROLES;
  roleMatrix(() => t, [
    { method: "post", path: "/api/admin/jobs/reminders/run", allowed: ["admin"] },
    { method: "get", path: "/api/admin/reminder-runs", allowed: ["admin"] },
    {
      method: "get",
      label: "/api/admin/reminder-runs/:id",
      path: async (x) => `/api/admin/reminder-runs/${(await runReminders({ ...x.app.deps }, { trigger: "manual" })).runId}`,
      allowed: ["admin"],
    },
    { method: "get", path: "/api/admin/outbox", allowed: ["admin"] },
    { method: "get", path: "/api/admin/outbox/0", allowed: ["admin"] },
    { method: "get", path: "/api/me/notification-preferences", allowed: everyone },
    { method: "put", path: "/api/me/notification-preferences", body: { myTools: true }, allowed: everyone },
  ]);
});
