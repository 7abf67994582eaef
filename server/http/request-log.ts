import type { IncomingHttpHeaders, OutgoingHttpHeaders } from "node:http";
import type { NextFunction, Request, Response } from "express";
import type { Logger } from "pino";

/** Headers that carry credentials never reach a log, at any level. */
const SECRET_HEADERS = new Set(["cookie", "set-cookie", "authorization", "x-csrf-token", "proxy-authorization"]);

function withoutSecrets(headers: IncomingHttpHeaders | OutgoingHttpHeaders): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(headers)) out[k] = SECRET_HEADERS.has(k.toLowerCase()) ? "[redacted]" : v;
  return out;
}

let lastRequestId = 0;

/**
 * Gives the request its id (1, 2, 3 … in this process) and `req.log`, a child of the app's logger that adds the id to
 * every line logged for the request. (pino-http did this and also built, at every request, a second child logger
 * around the serialised request, headers and all, for a line this app never writes.)
 */
export function identifyRequest(req: Request, logger: Logger) {
  lastRequestId = (lastRequestId + 1) & 0x7fffffff;
  req.id = lastRequestId;
  req.log = logger.child({ reqId: lastRequestId });
}

/**
 * One line per request at info — method, path, status, time taken and who asked — and the details
 * (query, request and response headers, credentials redacted) at debug. API requests are logged at
 * info; the client's files (scripts, styles, fonts, page loads) only at debug, so the info log reads
 * as what people did. Uses the request's logger (identifyRequest's child with the request id) when there is one.
 */
export function requestLog() {
  return (req: Request, res: Response, next: NextFunction) => {
    // Nothing to write at this level (the level is fixed at start): no timing, no listeners.
    if (!req.log?.isLevelEnabled(req.originalUrl.startsWith("/api") ? "info" : "debug")) return next();
    const started = process.hrtime.bigint();
    let done = false;
    const finish = () => {
      if (done) return;
      done = true;
      const log = req.log;
      if (!log) return;
      const ms = Math.round(Number(process.hrtime.bigint() - started) / 1e5) / 10;
      const path = req.originalUrl.split("?")[0];
      const userId = (req.user as { id?: string } | undefined)?.id ?? null;
      // A response the client gave up on before it was sent has no status of its own.
      const status = res.writableFinished ? res.statusCode : null;
      const line = { method: req.method, path, status, ms, userId };
      const message = `${req.method} ${path} ${status ?? "aborted"} ${ms} ms`;
      if (path.startsWith("/api")) log.info(line, message);
      else log.debug(line, message);
      if (log.isLevelEnabled("debug")) {
        log.debug(
          { method: req.method, path, query: req.query, ip: req.ip, requestHeaders: withoutSecrets(req.headers), responseHeaders: withoutSecrets(res.getHeaders()) },
          "request details",
        );
      }
    };
    res.on("finish", finish);
    res.on("close", finish);
    next();
  };
}
