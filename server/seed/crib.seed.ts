import { and, eq, isNull } from "drizzle-orm";
import type { SeedContext } from "./seed-context";
import { fixedClock } from "../platform/clock";
import { AppError } from "../http/errors";
import { checkoutsService } from "../modules/checkouts/checkouts.service";
import { checkoutsRepository } from "../modules/checkouts/checkouts.repository";
import { shipmentsService } from "../modules/shipments/shipments.service";
import { openHold } from "../modules/tools/tool-lifecycle.repository";
import { labShipments } from "../modules/shipments/shipments.table";
import { labs } from "../modules/labs/labs.table";
import { getSettings } from "../modules/settings/settings.service";
import { addDays, calendarDate } from "../../shared/common/dates";
import { zonedInstant } from "../../shared/checkouts/shift";
import { IssueToolSchema, ReturnToolSchema, type IssueToolInput, type ReturnToolInput } from "../../shared/checkouts/checkouts.schemas";
import { CreateShipmentSchema } from "../../shared/shipments/shipments.schemas";

const HOUR = 3_600_000;

/**
 * The crib's demo day (invented): two tools out with the demo mechanic since
 * this morning, one out with Ezra Okonkwo-Lind since yesterday and not back by
 * the end of that shift, a dial indicator away at Meridian Dimensional Lab,
 * and a micrometer that came back dropped. Everything relative to ctx.clock.
 */
export async function seedCrib(ctx: SeedContext): Promise<void> {
  const { db, config } = ctx;
  const now = ctx.clock.now();
  const settings = await getSettings(db, config.SHOP_TIME_ZONE);
  const tz = settings.shopTimeZone;
  const today = calendarDate(now, tz);
  const yesterday = addDays(today, -1);
  const crib = ctx.users.crib;
  const services = (at: Date) => {
    const deps = { db, clock: fixedClock(at), config, mailer: ctx.mailer, storage: ctx.storage };
    const c = checkoutsService(deps);
    const s = shipmentsService(deps);
    // Through the same schemas as the API, so demo data obeys the same rules.
    return {
      issue: (input: IssueToolInput) => c.issue(IssueToolSchema.parse(input), crib.id),
      return: (id: string, input: ReturnToolInput) => c.return(id, ReturnToolSchema.parse(input), undefined, crib.id),
      ship: (input: Parameters<typeof CreateShipmentSchema.parse>[0]) => s.ship(CreateShipmentSchema.parse(input), crib.id),
    };
  };
  const tool = (tag: string) => checkoutsRepository.findToolByTag(db, tag);
  // A demo tool the register did not make usable at that instant is simply left out.
  const tolerate = async <T>(work: () => Promise<T>): Promise<T | null> => {
    try {
      return await work();
    } catch (e) {
      if (e instanceof AppError) return null;
      throw e;
    }
  };

  // Routine history: a micrometer out and back last week.
  const lastWeek = zonedInstant(addDays(today, -6), "07:40", tz);
  if (await tool("MIC-0102")) {
    const out = await tolerate(() => services(lastWeek).issue({ assetTag: "MIC-0102", userEmail: ctx.people.mechanic3.email, workOrder: "WO-DEMO-2207" }));
    if (out) await tolerate(() => services(new Date(lastWeek.getTime() + 8 * HOUR)).return(out.id, { condition: "ok" }));
  }

  // Damaged on return: MIC-0111 came back dropped (its quarantine may already stand from the register).
  const dropped = await tool("MIC-0111");
  if (dropped) {
    const hold = await openHold(db, dropped.id);
    const back = hold ? hold.placedAt : new Date(now.getTime() - 3 * 24 * HOUR);
    const issuedAt = new Date(back.getTime() - 5 * HOUR);
    const note = "Dropped from the bench onto the concrete floor; thimble turns rough near 0.8 in.";
    if (hold) {
      // The hold is the register's; only the checkout history that led to it is added.
      const row = await checkoutsRepository.insert(db, {
        toolId: dropped.id,
        userId: ctx.people.mechanic3.id,
        issuedBy: crib.id,
        issuedAt,
        dueBackAt: new Date(back.getTime() + 2 * HOUR),
        workOrder: "WO-DEMO-2231",
      });
      await checkoutsRepository.close(db, row.id, { returnedAt: back, returnedBy: crib.id, returnCondition: "damaged", returnNote: note, returnPhotoKey: null });
    } else {
      const out = await tolerate(() => services(issuedAt).issue({ assetTag: "MIC-0111", userEmail: ctx.people.mechanic3.email, workOrder: "WO-DEMO-2231" }));
      if (out) await tolerate(() => services(back).return(out.id, { condition: "damaged", note }));
    }
  }

  // Away at an outside lab: DIA-0102 at Meridian Dimensional Lab, unless the register already sent it.
  const dia = await tool("DIA-0102");
  const [meridian] = await db.select().from(labs).where(eq(labs.name, "Meridian Dimensional Lab"));
  if (dia && meridian) {
    const [away] = await db.select().from(labShipments).where(and(eq(labShipments.toolId, dia.id), isNull(labShipments.receivedAt)));
    if (!away) {
      const shippedAt = new Date(now.getTime() - 12 * 24 * HOUR);
      await tolerate(() =>
        services(shippedAt).ship({ assetTags: ["DIA-0102"], labId: meridian.id, purchaseOrder: "PO-DEMO-4471", expectedBackAt: addDays(today, 9) }),
      );
    }
  }

  // Not back by the end of yesterday's shift: DIA-0101 with Ezra Okonkwo-Lind.
  const yMorning = zonedInstant(yesterday, "07:15", tz);
  if (await tool("DIA-0101")) {
    await tolerate(() =>
      services(yMorning).issue({ assetTag: "DIA-0101", userEmail: ctx.people.mechanic2.email, workOrder: "WO-DEMO-2240", engineSerial: "HF-DEMO-L360-0417" }),
    );
  }

  // Out with the demo mechanic since this morning, due back at the end of today's shift.
  const morning = new Date(Math.min(zonedInstant(today, "07:30", tz).getTime(), now.getTime() - HOUR));
  for (const tag of ["MIC-0101", "SHG-0101"]) {
    if (await tool(tag)) {
      await tolerate(() => services(morning).issue({ assetTag: tag, userEmail: ctx.users.mechanic.email, workOrder: "WO-DEMO-2251", engineSerial: "HF-DEMO-L360-0422" }));
    }
  }
  ctx.shared.cribSeeded = true;
}
