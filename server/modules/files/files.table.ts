import { pgTable, text, integer, timestamp, uuid, index } from "drizzle-orm/pg-core";
import { users } from "../users/users.table";

/**
 * Every file the upload routes stored, by the key they issued. A record may only name a file that was
 * issued for its purpose (a calibration certificate, a standard's certificate, a photo) and not yet
 * claimed by another record: keys are never accepted as typed by a client.
 */
export const storedFiles = pgTable(
  "stored_files",
  {
    key: text("key").primaryKey(),
    purpose: text("purpose", { enum: ["calibration_certificate", "standard_certificate", "tool_photo", "return_photo"] }).notNull(),
    contentType: text("content_type").notNull(),
    size: integer("size").notNull(),
    fileName: text("file_name").notNull(),
    uploadedBy: uuid("uploaded_by").references(() => users.id),
    uploadedAt: timestamp("uploaded_at", { withTimezone: true }).notNull(),
    /** The record that names the file ("calibration:<id>"), once one does; a file is claimed once. */
    claimedBy: text("claimed_by"),
    claimedAt: timestamp("claimed_at", { withTimezone: true }),
  },
  (t) => [index("stored_files_uploaded_by_idx").on(t.uploadedBy), index("stored_files_purpose_idx").on(t.purpose, t.uploadedAt)],
);
