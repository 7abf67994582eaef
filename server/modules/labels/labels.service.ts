import QRCode from "qrcode";
import { eq, inArray } from "drizzle-orm";
import { getSettings } from "../settings/settings.service";
import type { DbOrTx } from "../../db/client";
import type { CribDeps } from "../checkouts/checkouts.service";
import { toolByTag } from "../checkouts/checkouts.service";
import { checkoutsRepository } from "../checkouts/checkouts.repository";
import { statusContext, statusesFor, statusOf } from "../tools/tool-status.service";
import { calibrations } from "../calibrations/calibrations.table";
import { users } from "../users/users.table";
import { labs } from "../labs/labs.table";
import { AppError, refused } from "../../http/errors";
import { calendarDate } from "../../../shared/common/dates";
import type { CalibrationLabel, DoNotUseTag } from "../../../shared/checkouts/labels.schemas";

/** Who calibrated each calibration: the named technician, the user who logged it, or the outside lab. */
async function calibratedBy(db: DbOrTx, ids: string[]): Promise<Map<string, string>> {
  if (!ids.length) return new Map();
  const rows = await db
    .select({ id: calibrations.id, byName: calibrations.performedByName, user: users.name, lab: labs.name })
    .from(calibrations)
    .leftJoin(users, eq(users.id, calibrations.performedBy))
    .leftJoin(labs, eq(labs.id, calibrations.labId))
    .where(inArray(calibrations.id, ids));
  return new Map(rows.map((r) => [r.id, r.byName ?? r.lab ?? r.user ?? "—"]));
}

/** The short URL a label's QR code opens: the tool's status page. */
export function statusUrl(origin: string, assetTag: string) {
  return `${origin.replace(/\/+$/, "")}/t/${encodeURIComponent(assetTag)}`;
}

export const qrDataUrl = (url: string) => QRCode.toDataURL(url, { errorCorrectionLevel: "M", margin: 1, width: 240 });

export function labelsService(deps: CribDeps) {
  const { db, clock, config } = deps;
  return {
    /** What each calibration label shows, in the order asked for. */
    async calibrationLabels(tags: string[], origin: string): Promise<CalibrationLabel[]> {
      const tools = await checkoutsRepository.findToolsByTags(db, tags);
      const byTag = new Map(tools.map((t) => [t.assetTag.toUpperCase(), t]));
      const missing = tags.filter((t) => !byTag.has(t.toUpperCase()));
      if (missing.length) throw new AppError("tool_not_found", 404, `No tool ${missing.map((m) => `"${m}"`).join(", ")} in the register.`, { missing });
      const now = clock.now();
      const ctx = await statusContext(db, config.SHOP_TIME_ZONE);
      const statuses = await statusesFor(db, tools.map((t) => t.id), now, ctx);
      const by = await calibratedBy(db, [...statuses.values()].flatMap((s) => (s.lastCalibration ? [s.lastCalibration.id] : [])));
      return Promise.all(
        tags.map(async (tag) => {
          const t = byTag.get(tag.toUpperCase())!;
          const s = statuses.get(t.id)!;
          const url = statusUrl(origin, t.assetTag);
          return {
            assetTag: t.assetTag,
            description: t.description,
            status: s.status,
            usable: s.usable,
            calibratedAt: s.lastCalibration ? calendarDate(s.lastCalibration.performedAt, ctx.timeZone) : null,
            dueAt: s.dueAt,
            calibratedBy: s.lastCalibration ? (by.get(s.lastCalibration.id) ?? null) : null,
            statusUrl: url,
            qr: await qrDataUrl(url),
          };
        }),
      );
    },

    /** A do-not-use tag: only for a tool that may not be used (quarantine or otherwise take it out of use first). */
    async doNotUseTag(tag: string, origin: string, byName: string): Promise<DoNotUseTag> {
      const tool = await toolByTag(db, tag);
      const now = clock.now();
      const ctx = await statusContext(db, config.SHOP_TIME_ZONE);
      const s = await statusOf(db, tool.id, now, ctx);
      if (s.usable) {
        throw refused("tool_usable", `${tool.assetTag} may be used (${s.reasons[0] ?? s.status}); quarantine it first if it must not be.`, { status: s.status });
      }
      const url = statusUrl(origin, tool.assetTag);
      return {
        assetTag: tool.assetTag,
        description: tool.description,
        status: s.status,
        reasons: s.reasons,
        taggedOn: calendarDate(now, ctx.timeZone),
        taggedBy: byName,
        statusUrl: url,
        qr: await qrDataUrl(url),
      };
    },

    /** Shop name and today's date in the shop, for the sheet's heading. */
    async shop() {
      const s = await getSettings(db, config.SHOP_TIME_ZONE);
      return { shopName: s.shopName, today: calendarDate(clock.now(), s.shopTimeZone) };
    },
  };
}
