import { createHash, randomUUID } from "node:crypto";
import { promisify } from "node:util";
import zlib from "node:zlib";
import type { Request, Response } from "express";
import { LRUCache } from "lru-cache";
import type { DbOrTx } from "../../db/client";
import { notFound } from "../../http/errors";
import { jobsRepository } from "./jobs.repository";
import { assembleCheckSheet } from "./check-sheet.service";

/** How much memory the kept answers may take: about thirty sheets of 1,000 readings, or thousands of small ones. */
export const KEPT_SHEET_BYTES = 64 * 1024 * 1024;

const brotli = promisify(zlib.brotliCompress);
const gzip = promisify(zlib.gzip);
type Encoding = "br" | "gzip";

export interface SheetAnswer {
  /** The check sheet as JSON. */
  body: Buffer;
  /** The same, compressed once for every later request that accepts it (kept answers only). */
  encoded?: Partial<Record<Encoding, Promise<Buffer>>>;
  /** A validator of exactly this answer from this process (a restarted app may word a sheet differently); null for one not kept. */
  etag: string | null;
  /** True when the answer was kept from an earlier request. */
  kept: boolean;
}

interface Kept {
  stamp: string;
  body: Buffer;
  etag: string;
  encoded: Partial<Record<Encoding, Promise<Buffer>>>;
}

/**
 * Check sheets answered from a kept copy while nothing they show has changed (docs/decisions/020-kept-check-sheets.md).
 * A sheet is read far more often than it changes: every screen that shows it refetches it on focus and after each
 * reading elsewhere on the sheet. The stamp (jobsRepository.sheetStamp, one indexed statement) moves with every
 * reading, sign-off, stored judgement, open or closed investigation and change to a name, tool, family, limit table
 * or job the sheet shows; it is read before the sheet is built, so a change made while building gives the next
 * request a new stamp and a fresh build, never an old sheet under a new stamp. Per app, bounded by bytes.
 */
export function keptSheets(maxBytes = KEPT_SHEET_BYTES) {
  const boot = randomUUID();
  const kept = new LRUCache<string, Kept>({ maxSize: maxBytes, sizeCalculation: (k) => k.body.length + k.stamp.length + 200 });
  return {
    async answer(db: DbOrTx, jobId: string): Promise<SheetAnswer> {
      const stamp = await jobsRepository.sheetStamp(db, jobId);
      if (stamp === null) throw notFound("job", jobId);
      const hit = kept.get(jobId);
      if (hit && hit.stamp === stamp) return { body: hit.body, etag: hit.etag, encoded: hit.encoded, kept: true };
      const { sheet, judgedHere } = await assembleCheckSheet(db, jobId);
      const body = Buffer.from(JSON.stringify(sheet));
      const etag = `W/"${createHash("sha1").update(`${boot}|${jobId}|${stamp}`).digest("base64url")}"`;
      // A sheet with readings judged from evidence read now (not yet judged under the current rules) is not kept.
      if (judgedHere === 0 && body.length <= maxBytes / 4) {
        const encoded = {};
        kept.set(jobId, { stamp, body, etag, encoded });
        return { body, etag, encoded, kept: false };
      }
      kept.delete(jobId);
      return { body, etag: null, kept: false };
    },
    /** How many sheets are kept (for tests). */
    get size() {
      return kept.size;
    },
  };
}

/**
 * Sends a sheet's answer: a kept one compressed once (brotli or gzip, as the browser accepts, at the app's settings
 * for answers), then sent as it is to every request that accepts it; a fresh one as JSON for the app's compression. A
 * validator the browser sends back unchanged gets 304 (Express).
 */
export async function sendSheet(req: Request, res: Response, answer: SheetAnswer) {
  res.type("application/json");
  if (answer.etag) res.setHeader("ETag", answer.etag);
  // No Accept-Encoding at all: sent as it is (as the app's compression does).
  const encoding = answer.encoded && req.headers["accept-encoding"] ? (req.acceptsEncodings("br", "gzip", "identity") as Encoding | "identity" | false) : false;
  if (answer.encoded && (encoding === "br" || encoding === "gzip")) {
    let body = answer.encoded[encoding];
    if (!body) {
      // The app's own settings for answers (app.ts): the first request after a change waits for this.
      body = encoding === "br" ? brotli(answer.body, { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 1 } }) : gzip(answer.body, { level: 1 });
      answer.encoded[encoding] = body;
      // A failed compression is not kept: the next request tries again.
      body.catch(() => delete answer.encoded![encoding]);
    }
    res.setHeader("Content-Encoding", encoding);
    res.vary("Accept-Encoding");
    res.send(await body);
    return;
  }
  res.send(answer.body);
}
