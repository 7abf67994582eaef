import { and, eq, isNull } from "drizzle-orm";
import type { DbOrTx, Tx } from "../../db/client";
import { AppError } from "../../http/errors";
import { storedFiles } from "./files.table";

export type StoredFilePurpose = (typeof storedFiles.$inferInsert)["purpose"];

/** Records a file the upload route has just stored, under the key it issued. */
export async function recordStoredFile(db: DbOrTx, values: typeof storedFiles.$inferInsert) {
  await db.insert(storedFiles).values(values);
}

/**
 * Claims an issued file for the record that names it: the key must have been issued by the upload route
 * for this purpose and not be named by another record (one claim succeeds, by a conditional update).
 * Anything else — a typed key, `../`, another record's file — is 400 unknown_file.
 */
export async function claimStoredFile(tx: Tx, key: string, purpose: StoredFilePurpose, claimedBy: string, at: Date) {
  const [row] = await tx
    .update(storedFiles)
    .set({ claimedBy, claimedAt: at })
    .where(and(eq(storedFiles.key, key), eq(storedFiles.purpose, purpose), isNull(storedFiles.claimedBy)))
    .returning();
  if (!row) {
    throw new AppError("unknown_file", 400, "That file was not uploaded for this record (or another record already names it); upload the file again.", [
      { code: "custom", path: ["certificateFileKey"], message: "Upload the file first and use the key the upload answered." },
    ]);
  }
  return row;
}
