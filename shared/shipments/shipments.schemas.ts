import { z } from "zod";
import { CalendarDateSchema, InstantSchema, optionalText, PageQuerySchema } from "../common/lists.schemas";
import { AssetTagSchema, BoolTextSchema } from "../checkouts/checkouts.schemas";

/** Send one or several tools to an outside calibration lab. */
export const CreateShipmentSchema = z.object({
  assetTags: z
    .array(AssetTagSchema)
    .min(1, "Add at least one tool.")
    .max(100)
    .refine((tags) => new Set(tags.map((t) => t.toUpperCase())).size === tags.length, "Each tool only once."),
  labId: z.string().uuid("Choose the lab."),
  shippedAt: InstantSchema.optional(),
  purchaseOrder: optionalText(64),
  expectedBackAt: CalendarDateSchema.optional(),
});
export type CreateShipmentInput = z.input<typeof CreateShipmentSchema>;

/** A tool back from the lab; the calibration from its certificate is recorded next (with review). */
export const ReceiveShipmentSchema = z.object({ receivedAt: InstantSchema.optional() });
export type ReceiveShipmentInput = z.input<typeof ReceiveShipmentSchema>;

export const ShipmentListQuerySchema = PageQuerySchema.extend({
  open: BoolTextSchema.optional(),
  labId: z.string().uuid().optional(),
  q: z.string().trim().max(100).optional(),
});
export type ShipmentListQuery = Omit<z.input<typeof ShipmentListQuerySchema>, "page" | "pageSize"> & { page?: number; pageSize?: number };

export const ShipmentSchema = z.object({
  id: z.string(),
  tool: z.object({ id: z.string(), assetTag: z.string(), description: z.string() }),
  lab: z.object({ id: z.string(), name: z.string() }),
  shippedAt: z.string(),
  shippedBy: z.string().nullable(),
  purchaseOrder: z.string().nullable(),
  expectedBackAt: z.string().nullable(),
  receivedAt: z.string().nullable(),
  receivedBy: z.string().nullable(),
  /** Still away after the day it was expected back. */
  lateBack: z.boolean(),
});
export type Shipment = z.infer<typeof ShipmentSchema>;

export const ShipmentsCreatedSchema = z.object({ items: z.array(ShipmentSchema) });

export const LabOptionSchema = z.object({ id: z.string(), name: z.string(), accreditationExpiresAt: z.string().nullable() });
export type LabOption = z.infer<typeof LabOptionSchema>;
