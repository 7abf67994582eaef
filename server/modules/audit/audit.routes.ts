import { Router } from "express";
import { sql } from "drizzle-orm";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { auditRepository } from "./audit.repository";
import { AUDIT_TOTAL_CAP, AuditFacetsSchema, AuditPageSchema, AuditQuerySchema } from "../../../shared/audit/audit.schemas";
import { getSettings } from "../settings/settings.service";
import { auditRecordKey, describeAuditRecords } from "./audit-records";
import { auditActionLabel, auditRecordTypeLabel } from "../../../shared/audit/labels";

export function auditRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "audit");

  route(
    { method: "get", path: "/api/audit", summary: "The audit trail, newest first: filter by person, record and dates (a date is a whole day in the shop's zone); ?after= pages on by keyset; the total counts up to 10,000 lines", access: "audit.read", query: AuditQuerySchema, response: AuditPageSchema },
    async ({ query }) => {
      const { shopTimeZone } = await getSettings(deps.db, deps.config.SHOP_TIME_ZONE);
      // A calendar date means the whole day in the shop's time zone: from its first instant, to before the next day's.
      const bound = (v: string | undefined, end: boolean) =>
        !v
          ? undefined
          : /^\d{4}-\d{2}-\d{2}$/.test(v)
            ? sql`((${v}::date + ${end ? 1 : 0}::int)::timestamp at time zone ${shopTimeZone}::text)`
            : end
              ? sql`(${v}::timestamptz + interval '1 millisecond')`
              : sql`${v}::timestamptz`;
      const { items, total, totalCapped, nextCursor } = await auditRepository.list(deps.db, {
        ...query,
        fromInstant: bound(query.from, false),
        toInstantExclusive: bound(query.to, true),
        totalCap: AUDIT_TOTAL_CAP,
      });
      const records = await describeAuditRecords(deps.db, items);
      return {
        items: items.map((e) => ({
          ...e,
          at: e.at.toISOString(),
          actionLabel: auditActionLabel(e.action),
          entityTypeLabel: auditRecordTypeLabel(e.entityType),
          record: records.get(auditRecordKey(e.entityType, e.entityId)) ?? null,
        })),
        total,
        totalCapped,
        nextCursor,
      };
    },
  );

  route({ method: "get", path: "/api/audit/facets", summary: "Record types on the audit trail, for its filters", access: "audit.read", response: AuditFacetsSchema }, async () => {
    const entityTypes = await auditRepository.entityTypes(deps.db);
    return { entityTypes, actions: [], entityTypeOptions: entityTypes.map((value) => ({ value, label: auditRecordTypeLabel(value) })) };
  });

  return router;
}
