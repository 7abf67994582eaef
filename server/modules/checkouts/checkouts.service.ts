import type { Logger } from "pino";
import { checkPointOutsideRange } from "../../../shared/tools/check-range";
import type { Db, DbOrTx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { Config } from "../../config";
import type { Mailer } from "../../platform/mailer";
import type { ObjectStorage } from "../../platform/storage";
import { checkoutsRepository as repo, isNotReturned, type CheckoutViewRow, type ToolRow } from "./checkouts.repository";
import { statusContext, statusesFor, statusOf, type ToolStatusView } from "../tools/tool-status.service";
import { changeLifecycle, openHold, placeHold } from "../tools/tool-lifecycle.repository";
import { onOutOfToleranceFinding } from "../investigations/investigations.hooks";
import { recordAudit } from "../audit/audit.repository";
import { getSettings } from "../settings/settings.service";
import { AppError, notFound, refused } from "../../http/errors";
import { sniffFileType } from "../../http/upload";
import { recordStoredFile } from "../files/files.repository";
import { STATUS_LABELS } from "../../../shared/tools/tool-status";
import { calendarDate } from "../../../shared/common/dates";
import { dec, num } from "../../../shared/common/decimal";
import { endOfShiftAfter, shopDateTime } from "../../../shared/checkouts/shift";
import type {
  Checkout,
  CheckoutListQuerySchema,
  IssueResult,
  IssueToolSchema,
  LostFoundResult,
  MyTool,
  ReturnResult,
  ReturnToolSchema,
} from "../../../shared/checkouts/checkouts.schemas";
import type { z } from "zod";

export interface CribDeps {
  db: Db;
  clock: Clock;
  config: Config;
  mailer?: Mailer;
  storage?: ObjectStorage | null;
  /** Told of what fails after a reply was sent (an investigation's readings not gathered). */
  logger?: Logger;
}

export interface UploadedPhoto {
  buffer: Buffer;
  mimetype: string;
  originalname: string;
}

/** The PostgreSQL error under Drizzle's wrapper, if any. */
export function pgError(e: unknown): { code?: string; constraint?: string } | undefined {
  const err = e as { code?: string; constraint?: string; cause?: unknown } | undefined;
  if (err?.code) return err;
  return (err?.cause as { code?: string; constraint?: string } | undefined) ?? undefined;
}

/** True when the error is PostgreSQL refusing a duplicate under the named unique index. */
export function isUniqueViolation(e: unknown, constraint: string) {
  const p = pgError(e);
  return p?.code === "23505" && p.constraint === constraint;
}

const PHOTO_TYPES = new Set(["image/jpeg", "image/png", "image/webp", "image/heic", "image/heif"]);

/** Looks a tool up by asset tag or answers 404 naming the tag. */
export async function toolByTag(db: DbOrTx, tag: string): Promise<ToolRow> {
  const tool = await repo.findToolByTag(db, tag);
  if (!tool) throw notFound("tool", tag);
  return tool;
}

export function toCheckout(row: CheckoutViewRow, status: ToolStatusView | undefined, now: Date): Checkout {
  const c = row.checkout;
  return {
    id: c.id,
    tool: {
      ...row.tool,
      rangeMin: Number(row.tool.rangeMin),
      rangeMax: Number(row.tool.rangeMax),
      status: status?.status ?? "never_calibrated",
      usable: status?.usable ?? false,
      dueAt: status?.dueAt ?? null,
    },
    person: row.person,
    issuedAt: c.issuedAt.toISOString(),
    issuedBy: row.issuedByName,
    dueBackAt: c.dueBackAt.toISOString(),
    workOrder: c.workOrder,
    engineSerial: c.engineSerial,
    returnedAt: c.returnedAt?.toISOString() ?? null,
    returnedBy: row.returnedByName,
    returnCondition: c.returnCondition,
    returnNote: c.returnNote,
    hasPhoto: !!c.returnPhotoKey,
    notBackInTime: isNotReturned(c, now),
  };
}

export function checkoutsService(deps: CribDeps) {
  const { db, clock, config } = deps;
  const zone = () => config.SHOP_TIME_ZONE;
  const findingDeps = async (tx: DbOrTx) => ({ clock, mailer: deps.mailer, logger: deps.logger, timeZone: (await statusContext(tx, zone())).timeZone });

  async function views(rows: CheckoutViewRow[], now: Date): Promise<Checkout[]> {
    const ctx = await statusContext(db, zone());
    const statuses = await statusesFor(db, [...new Set(rows.map((r) => r.tool.id))], now, ctx);
    return rows.map((r) => toCheckout(r, statuses.get(r.tool.id), now));
  }

  async function viewOne(id: string, now: Date) {
    const row = await repo.view(db, id);
    if (!row) throw notFound("checkout", id);
    return (await views([row], now))[0];
  }

  /** Keeps the refusal, so the crib can show later why a tool was turned away. */
  async function refuse(err: AppError, toolId: string, userId: string | null, actorId: string, at: Date): Promise<never> {
    await repo.recordRefusal(db, { toolId, userId, refusedBy: actorId, at, code: err.code, reason: err.message });
    throw err;
  }

  return {
    views,
    viewOne,

    /**
     * Issues a tool to a person. The shared status derivation decides whether
     * it may go out; the partial unique index checkouts_one_open_per_tool
     * decides, under concurrency, who gets it.
     */
    async issue(input: z.infer<typeof IssueToolSchema>, actorId: string): Promise<IssueResult> {
      const now = clock.now();
      const tool = await toolByTag(db, input.assetTag);
      const person = await repo.findPerson(db, input);
      if (!person) {
        const who = input.userEmail ?? input.badgeCode ?? input.userId;
        throw new AppError("person_not_found", 404, `Nobody signs in as or carries the badge "${who}"; check the name, e-mail or badge.`);
      }
      if (!person.active) throw refused("person_inactive", `${person.name} is no longer active in Tenthwise; tools are not issued to them.`);

      if (tool.ownerType === "personal") {
        const owner = tool.ownerUserId ? await repo.nameOf(db, tool.ownerUserId) : null;
        await refuse(
          refused("personal_tool", `${tool.assetTag} is ${owner ? `${owner}'s` : "a"} personal tool; it is not issued from the crib. Its owner sees it under "My tools".`),
          tool.id,
          person.id,
          actorId,
          now,
        );
      }

      const settings = await getSettings(db, zone());
      const ctx = { timeZone: settings.shopTimeZone, dueSoonDays: settings.dueSoonDays };
      const dueBackAt = input.dueBackAt ? new Date(input.dueBackAt) : endOfShiftAfter(now, settings.endOfShift, settings.shopTimeZone);
      if (dueBackAt.getTime() <= now.getTime()) {
        throw new AppError("invalid_input", 400, "The expected return must be later than now.", [{ path: ["dueBackAt"], message: "Must be later than now." }]);
      }

      const status = await statusOf(db, tool.id, now, ctx);
      if (status.custodian) {
        await refuse(alreadyOut(tool.assetTag, status.custodian, ctx.timeZone), tool.id, person.id, actorId, now);
      }
      // A reference-only tool is usable but never for acceptance readings: it goes
      // out only when the attendant confirms it is wanted for reference use.
      const referenceOnly = status.status === "reference_only";
      if (!status.usable || (referenceOnly && !input.referenceUseOnly)) {
        await refuse(notUsable(tool.assetTag, status), tool.id, person.id, actorId, now);
      }

      let checkoutId: string;
      try {
        checkoutId = await db.transaction(async (tx) => {
          const row = await repo.insert(tx, {
            toolId: tool.id,
            userId: person.id,
            issuedBy: actorId,
            issuedAt: now,
            dueBackAt,
            workOrder: input.workOrder ?? null,
            engineSerial: input.engineSerial ?? null,
          });
          await recordAudit(tx, { actorId, action: "checkout.issue", entityType: "checkout", entityId: row.id, after: row, at: now });
          return row.id;
        });
      } catch (e) {
        if (!isUniqueViolation(e, "checkouts_one_open_per_tool")) throw e;
        const holder = (await statusOf(db, tool.id, clock.now(), ctx)).custodian;
        return refuse(alreadyOut(tool.assetTag, holder, ctx.timeZone), tool.id, person.id, actorId, now);
      }

      const warnings: string[] = [];
      const backDay = calendarDate(dueBackAt, ctx.timeZone);
      if (status.dueAt && status.dueAt < backDay) {
        warnings.push(`${tool.assetTag} falls due for calibration on ${status.dueAt}, before it is expected back (${backDay}); have it back at the crib by then.`);
      }
      if (status.usesRemaining != null && status.usesRemaining <= 1) {
        warnings.push(`This is the last issue of ${tool.assetTag} before its usage limit; it needs calibrating when it comes back.`);
      }
      if (referenceOnly) warnings.push(`${tool.assetTag} is for reference only: never for acceptance readings.`);
      if (status.status === "limited" || status.status === "due_soon") warnings.push(...status.reasons);
      return { ...(await viewOne(checkoutId, now)), warnings };
    },

    /** Takes a tool back: condition, note, photo, optional zero check; damaged quarantines it at once. */
    async return(id: string, input: z.infer<typeof ReturnToolSchema>, photo: UploadedPhoto | undefined, actorId: string): Promise<ReturnResult> {
      const now = clock.now();
      const existing = await repo.findById(db, id);
      if (!existing) throw notFound("checkout", id);
      if (existing.returnedAt) throw refused("already_returned", `This tool was already returned on ${calendarDate(existing.returnedAt, zone())}.`);
      // The bytes decide, not the declared type: HTML sent as image/png is no photo.
      const photoType = photo ? sniffFileType(photo.buffer) : null;
      if (photo && (!photoType || !PHOTO_TYPES.has(photoType))) {
        throw new AppError("invalid_input", 400, "The photo must be a JPEG, PNG, WebP or HEIC image.", [{ path: ["photo"], message: "Not an image." }]);
      }
      const tool = (await repo.findToolById(db, existing.toolId))!;
      let tolerance: string | null = null;
      if (input.zeroCheck) {
        // A zero check on a point the tool cannot read (0 on a 1–2 in micrometer) would "pass" on nothing.
        const outside = checkPointOutsideRange(input.zeroCheck.nominal, tool);
        if (outside) throw new AppError("check_outside_range", 400, outside, [{ code: "custom", path: ["zeroCheck", "nominal"], message: outside }]);
        tolerance = await repo.checkToleranceOf(db, tool.familyId);
        if (!tolerance) throw refused("no_check_tolerance", `The family of ${tool.assetTag} has no check tolerance or permissible error, so a zero check cannot be judged; set it in the register.`);
        if (input.zeroCheck.standardId && !(await repo.standardExists(db, input.zeroCheck.standardId))) throw notFound("standard", input.zeroCheck.standardId);
      }
      if (photo && !deps.storage) throw new AppError("storage_unavailable", 503, "Photo storage is not available; return the tool without the photo.");
      const photoKey = photo ? await deps.storage!.put(`checkouts/${id}`, photo.buffer, photoType!, photo.originalname) : null;

      const messages: string[] = [];
      const outcome = await db.transaction(async (tx) => {
        const closed = await repo.close(tx, id, {
          returnedAt: now,
          returnedBy: actorId,
          returnCondition: input.condition,
          returnNote: input.note ?? null,
          returnPhotoKey: photoKey,
        });
        if (!closed) throw refused("already_returned", "This tool was returned a moment ago by someone else.");
        if (photoKey) {
          await recordStoredFile(tx, { key: photoKey, purpose: "return_photo", contentType: photoType!, size: photo!.buffer.length, fileName: photo!.originalname || "photo", uploadedBy: actorId, uploadedAt: now, claimedBy: `checkout:${id}`, claimedAt: now });
        }
        await recordAudit(tx, { actorId, action: "checkout.return", entityType: "checkout", entityId: id, before: existing, after: closed, at: now });
        const fdeps = await findingDeps(tx);
        let investigationId: string | null = null;
        let quarantined = false;

        if (input.condition === "damaged") {
          if (await openHold(tx, tool.id)) messages.push(`${tool.assetTag} was already quarantined; it stays quarantined.`);
          else await placeHold(tx, { toolId: tool.id, reason: `Returned damaged${input.note ? `: ${input.note}` : ""}`, actorId, at: now });
          quarantined = true;
          messages.push(`${tool.assetTag} is quarantined: it may not be issued or used until released after inspection or calibration.`);
          investigationId = (await onOutOfToleranceFinding(tx, fdeps, { kind: "damaged", toolId: tool.id, checkoutId: id, at: now, actorId }))?.investigationId ?? null;
        }

        let zeroCheck: ReturnResult["zeroCheck"] = null;
        if (input.zeroCheck) {
          const deviation = dec(input.zeroCheck.reading).minus(dec(input.zeroCheck.nominal));
          // Within tolerance when |deviation| ≤ tolerance: a value on the limit is on the limit (exact decimals).
          const passed = deviation.abs().lte(dec(tolerance!));
          const check = await repo.insertCheck(tx, {
            toolId: tool.id,
            performedAt: now,
            performedBy: actorId,
            standardId: input.zeroCheck.standardId ?? null,
            nominal: dec(input.zeroCheck.nominal).toString(),
            reading: dec(input.zeroCheck.reading).toString(),
            deviation: deviation.toString(),
            tolerance: tolerance!,
            passed,
            context: "return_zero_check",
            note: input.note ?? null,
          });
          await recordAudit(tx, { actorId, action: "check.record", entityType: "intermediate_check", entityId: check.id, after: check, at: now });
          zeroCheck = { id: check.id, passed, deviation: num(deviation), tolerance: num(dec(tolerance!)) };
          if (!passed) {
            messages.push(`Zero check failed (off by ${deviation.toString()} ${tool.unit}, tolerance ${tolerance} ${tool.unit}): ${tool.assetTag} is out of tolerance until recalibrated.`);
            const found = await onOutOfToleranceFinding(tx, fdeps, { kind: "check_failure", toolId: tool.id, checkId: check.id, at: now, actorId });
            investigationId = found?.investigationId ?? investigationId;
          }
        }
        return { quarantined, zeroCheck, investigationId };
      });
      return { ...(await viewOne(id, now)), ...outcome, messages };
    },

    async list(q: z.infer<typeof CheckoutListQuerySchema>) {
      const now = clock.now();
      const { items, total } = await repo.list(db, { ...q, at: now });
      return { items: await views(items, now), total };
    },

    /** Tools issued to a person and their own personal tools, each with status and due date. */
    async toolsOf(userId: string): Promise<{ items: MyTool[] }> {
      const now = clock.now();
      const [issued, own] = await Promise.all([repo.openOfPerson(db, userId), repo.personalToolsOf(db, userId)]);
      const ctx = await statusContext(db, zone());
      const statuses = await statusesFor(db, [...issued.map((r) => r.tool.id), ...own.map((t) => t.id)], now, ctx);
      const entry = (toolId: string) => {
        const s = statuses.get(toolId)!;
        return { status: s.status, usable: s.usable, reasons: s.reasons, dueAt: s.dueAt };
      };
      return {
        items: [
          ...issued.map((r) => ({
            assetTag: r.tool.assetTag,
            description: r.tool.description,
            relation: "issued" as const,
            ...entry(r.tool.id),
            checkoutId: r.checkout.id,
            since: r.checkout.issuedAt.toISOString(),
            dueBackAt: r.checkout.dueBackAt.toISOString(),
          })),
          ...own.map((t) => ({ assetTag: t.assetTag, description: t.description, relation: "own" as const, ...entry(t.id), checkoutId: null, since: null, dueBackAt: null })),
        ],
      };
    },

    async photo(id: string) {
      const c = await repo.findById(db, id);
      if (!c?.returnPhotoKey || !deps.storage) throw notFound("photo of checkout", id);
      return deps.storage.get(c.returnPhotoKey);
    },

    /**
     * Reports a tool lost. Its open checkout stays open: the person who had it
     * remains on the custody board until it is found. Loss opens the
     * out-of-tolerance investigation (its readings can no longer be vouched for).
     */
    async markLost(tag: string, reason: string, actorId: string): Promise<LostFoundResult> {
      const now = clock.now();
      const tool = await toolByTag(db, tag);
      const open = await repo.openOfTool(db, tool.id);
      const investigationId = await db.transaction(async (tx) => {
        await changeLifecycle(tx, { toolId: tool.id, lifecycle: "lost", reason, actorId, at: now });
        return (await onOutOfToleranceFinding(tx, await findingDeps(tx), { kind: "lost", toolId: tool.id, at: now, actorId }))?.investigationId ?? null;
      });
      const holder = open ? await repo.view(db, open.id) : undefined;
      const status = await statusOf(db, tool.id, now, await statusContext(db, zone()));
      const messages = [`${tool.assetTag} is recorded as lost; it cannot be issued or used.`];
      if (holder) messages.push(`It was last issued to ${holder.person.name}; that checkout stays open until the tool is found.`);
      return {
        assetTag: tool.assetTag,
        lifecycle: "lost",
        status: status.status,
        reasons: status.reasons,
        custodian: holder ? { name: holder.person.name, email: holder.person.email, checkoutId: holder.checkout.id } : null,
        investigationId,
        messages,
      };
    },

    /**
     * A lost tool found again: back to active, any open checkout closed, and a
     * hold placed so it is not used until a passing check or calibration
     * releases it (a found tool may have been dropped or misused).
     */
    async markFound(tag: string, reason: string, actorId: string): Promise<LostFoundResult> {
      const now = clock.now();
      const tool = await toolByTag(db, tag);
      if (tool.lifecycle !== "lost") throw refused("tool_not_lost", `${tool.assetTag} is not recorded as lost (it is ${tool.lifecycle}).`);
      const open = await repo.openOfTool(db, tool.id);
      const holder = open ? await repo.view(db, open.id) : undefined;
      await db.transaction(async (tx) => {
        await changeLifecycle(tx, { toolId: tool.id, lifecycle: "active", reason: `Found: ${reason}`, actorId, at: now });
        if (open) {
          const closed = await repo.close(tx, open.id, { returnedAt: now, returnedBy: actorId, returnCondition: null, returnNote: `Found after being reported lost: ${reason}`, returnPhotoKey: null });
          await recordAudit(tx, { actorId, action: "checkout.return", entityType: "checkout", entityId: open.id, before: open, after: closed, at: now });
        }
        if (!(await openHold(tx, tool.id))) {
          await placeHold(tx, { toolId: tool.id, reason: `Found after being reported lost (${reason}) — verify with a check or calibration before use.`, actorId, at: now });
        }
      });
      const status = await statusOf(db, tool.id, now, await statusContext(db, zone()));
      const messages = [`${tool.assetTag} is back in the register but held: release it after a passing check or calibration.`];
      if (holder) messages.push(`The checkout to ${holder.person.name} is closed.`);
      return {
        assetTag: tool.assetTag,
        lifecycle: "active",
        status: status.status,
        reasons: status.reasons,
        custodian: holder ? { name: holder.person.name, email: holder.person.email, checkoutId: holder.checkout.id } : null,
        investigationId: null,
        messages,
      };
    },
  };
}

function alreadyOut(assetTag: string, holder: ToolStatusView["custodian"], timeZone: string) {
  return refused(
    "already_checked_out",
    holder ? `${assetTag} is already out with ${holder.name} since ${shopDateTime(holder.since, timeZone)}; it must be returned first.` : `${assetTag} is already checked out; it must be returned first.`,
    holder ? { custodian: { name: holder.name, email: holder.email, checkoutId: holder.checkoutId, since: holder.since, dueBackAt: holder.dueBackAt } } : undefined,
  );
}

function notUsable(assetTag: string, s: ToolStatusView) {
  const label = STATUS_LABELS[s.status].toLowerCase();
  const why = s.reasons[0] ? ` ${s.reasons[0]}` : "";
  return refused("tool_not_usable", `${assetTag} may not be issued: it is ${label}.${why}`, {
    status: s.status,
    reasons: s.reasons,
    dueAt: s.dueAt,
    ...(s.status === "reference_only" ? { confirm: "referenceUseOnly" } : {}),
  });
}
