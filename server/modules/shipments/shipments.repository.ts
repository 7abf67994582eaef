import { and, asc, count, desc, eq, ilike, isNull, or, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { DbOrTx } from "../../db/client";
import { labShipments } from "./shipments.table";
import { labs } from "../labs/labs.table";
import { tools } from "../tools/tools.table";
import { users } from "../users/users.table";
import { listPage, pageOffset } from "../../db/paging";

const shipper = alias(users, "shipper");
const receiver = alias(users, "receiver");

const viewColumns = {
  shipment: labShipments,
  tool: { id: tools.id, assetTag: tools.assetTag, description: tools.description },
  lab: { id: labs.id, name: labs.name },
  shippedByName: shipper.name,
  receivedByName: receiver.name,
};
export type ShipmentViewRow = {
  shipment: typeof labShipments.$inferSelect;
  tool: { id: string; assetTag: string; description: string };
  lab: { id: string; name: string };
  shippedByName: string | null;
  receivedByName: string | null;
};

const viewQuery = (db: DbOrTx) =>
  db
    .select(viewColumns)
    .from(labShipments)
    .innerJoin(tools, eq(tools.id, labShipments.toolId))
    .innerJoin(labs, eq(labs.id, labShipments.labId))
    .leftJoin(shipper, eq(shipper.id, labShipments.shippedBy))
    .leftJoin(receiver, eq(receiver.id, labShipments.receivedBy));

export const shipmentsRepository = {
  findLab: async (db: DbOrTx, id: string) => (await db.select().from(labs).where(eq(labs.id, id)))[0],
  listLabs: (db: DbOrTx) => db.select({ id: labs.id, name: labs.name, accreditationExpiresAt: labs.accreditationExpiresAt }).from(labs).orderBy(asc(labs.name)),
  insert: async (tx: DbOrTx, values: (typeof labShipments.$inferInsert)[]) => tx.insert(labShipments).values(values).returning(),
  findById: async (db: DbOrTx, id: string) => (await db.select().from(labShipments).where(eq(labShipments.id, id)))[0],
  async receive(tx: DbOrTx, id: string, at: Date, by: string) {
    const [row] = await tx.update(labShipments).set({ receivedAt: at, receivedBy: by }).where(and(eq(labShipments.id, id), isNull(labShipments.receivedAt))).returning();
    return row ?? null;
  },
  views: (db: DbOrTx, ids: string[]) => viewQuery(db).where(sql`${labShipments.id} = any(${sql`array[${sql.join(ids.map((i) => sql`${i}::uuid`), sql`, `)}]`})`),
  async list(db: DbOrTx, f: { open?: boolean; labId?: string; q?: string; page: number; pageSize: number }) {
    const like = f.q ? `%${f.q.replace(/[%_\\]/g, (c) => `\\${c}`)}%` : null;
    const where = and(
      f.open === true ? isNull(labShipments.receivedAt) : f.open === false ? sql`${labShipments.receivedAt} is not null` : undefined,
      f.labId ? eq(labShipments.labId, f.labId) : undefined,
      like ? or(ilike(tools.assetTag, like), ilike(tools.description, like), ilike(labShipments.purchaseOrder, like), ilike(labs.name, like)) : undefined,
    );
    return listPage(
      viewQuery(db).where(where).orderBy(f.open ? asc(labShipments.shippedAt) : desc(labShipments.shippedAt), asc(labShipments.id)).limit(f.pageSize).offset(pageOffset(f.page, f.pageSize)),
      db.select({ total: count() }).from(labShipments).innerJoin(tools, eq(tools.id, labShipments.toolId)).innerJoin(labs, eq(labs.id, labShipments.labId)).where(where),
    );
  },
};
