import zlib from "node:zlib";
import Negotiator from "negotiator";
import type { NextFunction, Request, Response } from "express";

/** Below this an answer goes as it is (the compression middleware's own threshold). */
const THRESHOLD = 1024;
/** Above this an answer is left to the compression middleware, which compresses it off the main thread in pieces. */
const MAX_BYTES = 128 * 1024;
const BROTLI = { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 1 } };

/**
 * A JSON answer sent whole (one `end` with the body, nothing written before) is compressed in one step on the spot and
 * sent with its length: headers and body leave in one write. Through the compression middleware the same answer is
 * compressed by a stream on the thread pool and leaves in three writes (the headers with the start of the stream, the
 * compressed body as a chunk, the end of the chunks), with two hand-overs between threads; on a machine where each of
 * those costs a context switch, that was most of what separated a 35 kB register page sent compressed from the same
 * page sent plain. Brotli when the client offers it (every current browser), else gzip; anything this leaves alone
 * (streams, files, large answers, a client that accepts neither) still goes through the compression middleware.
 *
 * Mount after the compression middleware: this `end` runs first, and the middleware then sees the answer encoded.
 */
export function compressWholeAnswers() {
  return (req: Request, res: Response, next: NextFunction) => {
    const end = res.end;
    res.end = function (this: Response, chunk?: unknown, encoding?: unknown, cb?: unknown) {
      if (!this.headersSent && req.method !== "HEAD" && (typeof chunk === "string" || Buffer.isBuffer(chunk)) && !this.getHeader("Content-Encoding")) {
        const type = String(this.getHeader("Content-Type") ?? "");
        if (type.startsWith("application/json")) {
          const body = typeof chunk === "string" ? Buffer.from(chunk, typeof encoding === "string" ? (encoding as BufferEncoding) : "utf8") : chunk;
          if (body.length >= THRESHOLD && body.length <= MAX_BYTES && !/(?:^|,)\s*no-transform\s*(?:,|$)/i.test(String(this.getHeader("Cache-Control") ?? ""))) {
            const method = new Negotiator(req).encoding(["br", "gzip", "identity"], { preferred: ["br", "gzip"] });
            this.vary("Accept-Encoding");
            if (method === "br" || method === "gzip") {
              const out = method === "br" ? zlib.brotliCompressSync(body, BROTLI) : zlib.gzipSync(body, { level: 1 });
              this.setHeader("Content-Encoding", method);
              this.setHeader("Content-Length", out.length);
              return (end as (...a: unknown[]) => Response).call(this, out, typeof encoding === "function" ? encoding : cb);
            }
          }
        }
      }
      return (end as (...a: unknown[]) => Response).call(this, chunk, encoding, cb);
    } as Response["end"];
    next();
  };
}
