import type { z } from "zod";
import type { CribDeps } from "../checkouts/checkouts.service";
import { isUniqueViolation } from "../checkouts/checkouts.service";
import { checkoutsRepository } from "../checkouts/checkouts.repository";
import { shipmentsRepository as repo, type ShipmentViewRow } from "./shipments.repository";
import { statusContext, statusesFor } from "../tools/tool-status.service";
import { recordAudit } from "../audit/audit.repository";
import { AppError, notFound, refused } from "../../http/errors";
import { calendarDate } from "../../../shared/common/dates";
import { shopDateTime } from "../../../shared/checkouts/shift";
import type { CreateShipmentSchema, ReceiveShipmentSchema, Shipment, ShipmentListQuerySchema } from "../../../shared/shipments/shipments.schemas";

export function toShipment(r: ShipmentViewRow, today: string): Shipment {
  const s = r.shipment;
  return {
    id: s.id,
    tool: r.tool,
    lab: r.lab,
    shippedAt: s.shippedAt.toISOString(),
    shippedBy: r.shippedByName,
    purchaseOrder: s.purchaseOrder,
    expectedBackAt: s.expectedBackAt,
    receivedAt: s.receivedAt?.toISOString() ?? null,
    receivedBy: r.receivedByName,
    lateBack: !s.receivedAt && !!s.expectedBackAt && s.expectedBackAt < today,
  };
}

/** Tools sent to outside calibration labs and received back; status at_calibration follows from these records. */
export function shipmentsService(deps: CribDeps) {
  const { db, clock, config } = deps;
  const today = async () => calendarDate(clock.now(), (await statusContext(db, config.SHOP_TIME_ZONE)).timeZone);
  const views = async (ids: string[]) => {
    const t = await today();
    const rows = ids.length ? await repo.views(db, ids) : [];
    const order = new Map(ids.map((id, i) => [id, i]));
    return rows.sort((a, b) => order.get(a.shipment.id)! - order.get(b.shipment.id)!).map((r) => toShipment(r, t));
  };

  return {
    labs: () => repo.listLabs(db),

    /** Ships several tools to one lab, all or none: a tool out with a person, already away, lost or retired refuses the lot. */
    async ship(input: z.infer<typeof CreateShipmentSchema>, actorId: string) {
      const now = clock.now();
      const shippedAt = input.shippedAt ? new Date(input.shippedAt) : now;
      if (shippedAt.getTime() > now.getTime() + 5 * 60_000) {
        throw new AppError("invalid_input", 400, "The shipping date cannot be in the future.", [{ path: ["shippedAt"], message: "In the future." }]);
      }
      // The expected return is a promise about the future: a date already past is a slip.
      const shopToday = await today();
      if (input.expectedBackAt && input.expectedBackAt < calendarDate(shippedAt, (await statusContext(db, config.SHOP_TIME_ZONE)).timeZone)) {
        const message = `The expected return (${input.expectedBackAt}) is before the shipping date; give a date from ${shopToday} on.`;
        throw new AppError("invalid_input", 400, message, [{ code: "custom", path: ["expectedBackAt"], message }]);
      }
      const lab = await repo.findLab(db, input.labId);
      if (!lab) throw notFound("lab", input.labId);
      const found = await checkoutsRepository.findToolsByTags(db, input.assetTags);
      const byTag = new Map(found.map((t) => [t.assetTag.toUpperCase(), t]));
      const missing = input.assetTags.filter((t) => !byTag.has(t.trim().toUpperCase()));
      if (missing.length) throw new AppError("tool_not_found", 404, `No tool ${missing.map((m) => `"${m}"`).join(", ")} in the register.`, { missing });
      const list = input.assetTags.map((t) => byTag.get(t.trim().toUpperCase())!);

      const ctx = await statusContext(db, config.SHOP_TIME_ZONE);
      const statuses = await statusesFor(db, list.map((t) => t.id), now, ctx);
      const problems: { assetTag: string; code: string; message: string }[] = [];
      for (const t of list) {
        const s = statuses.get(t.id)!;
        if (s.custodian) problems.push({ assetTag: t.assetTag, code: "tool_checked_out", message: `${t.assetTag} is out with ${s.custodian.name}; return it to the crib first.` });
        else if (s.status === "at_calibration") problems.push({ assetTag: t.assetTag, code: "already_at_lab", message: `${t.assetTag} is already away: ${s.reasons[0] ?? ""}` });
        else if (s.status === "lost" || s.status === "retired") problems.push({ assetTag: t.assetTag, code: "tool_not_shippable", message: `${t.assetTag} is ${s.status}; it cannot be shipped.` });
      }
      if (problems.length) {
        const code = problems.every((p) => p.code === problems[0].code) ? problems[0].code : "tools_not_shippable";
        throw refused(code, problems.map((p) => p.message).join(" "), { tools: problems });
      }

      let ids: string[];
      try {
        ids = await db.transaction(async (tx) => {
          const rows = await repo.insert(
            tx,
            list.map((t) => ({ toolId: t.id, labId: lab.id, shippedAt, shippedBy: actorId, purchaseOrder: input.purchaseOrder ?? null, expectedBackAt: input.expectedBackAt ?? null })),
          );
          for (const r of rows) await recordAudit(tx, { actorId, action: "shipment.ship", entityType: "lab_shipment", entityId: r.id, after: r, at: now });
          return rows.map((r) => r.id);
        });
      } catch (e) {
        if (isUniqueViolation(e, "lab_shipments_one_open_per_tool")) throw refused("already_at_lab", "One of these tools was shipped a moment ago by someone else; reload the list.");
        throw e;
      }
      return { items: await views(ids) };
    },

    async receive(id: string, input: z.infer<typeof ReceiveShipmentSchema>, actorId: string): Promise<Shipment> {
      const now = clock.now();
      const existing = await repo.findById(db, id);
      if (!existing) throw notFound("shipment", id);
      const tz = (await statusContext(db, config.SHOP_TIME_ZONE)).timeZone;
      if (existing.receivedAt) throw refused("already_received", `This tool was received back on ${shopDateTime(existing.receivedAt, tz)}.`);
      const receivedAt = input.receivedAt ? new Date(input.receivedAt) : now;
      if (receivedAt.getTime() < existing.shippedAt.getTime() || receivedAt.getTime() > now.getTime() + 5 * 60_000) {
        throw new AppError("invalid_input", 400, "The receiving date must lie between shipping and now.", [{ path: ["receivedAt"], message: "Out of range." }]);
      }
      await db.transaction(async (tx) => {
        const row = await repo.receive(tx, id, receivedAt, actorId);
        if (!row) throw refused("already_received", "This tool was received a moment ago by someone else.");
        await recordAudit(tx, { actorId, action: "shipment.receive", entityType: "lab_shipment", entityId: id, before: existing, after: row, at: now });
      });
      return (await views([id]))[0];
    },

    async list(q: z.infer<typeof ShipmentListQuerySchema>) {
      const { items, total } = await repo.list(db, q);
      const t = await today();
      return { items: items.map((r) => toShipment(r, t)), total };
    },
  };
}
