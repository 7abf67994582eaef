import type { ErrorRequestHandler, Response } from "express";
import { ZodError } from "zod";
import { AppError } from "./errors";
import { SecondConnectionInTransactionError } from "../db/client";

type PgLike = { code?: string; constraint?: string; message?: string; cause?: unknown };

/** The PostgreSQL (or socket) error under Drizzle's wrapper, if any. */
export function driverError(err: unknown): PgLike | undefined {
  let e = err as PgLike | undefined;
  for (let i = 0; i < 4 && e; i++) {
    if (typeof e.code === "string") return e;
    e = e.cause as PgLike | undefined;
  }
  return undefined;
}

// SQLSTATEs and socket errors that mean "the database is not there right now": restarting, shut down,
// refusing connections, the connection dropped, or no pooled connection free in time. The request did
// not change anything that was acknowledged; the client may try again.
const UNAVAILABLE_CODES = new Set(["57P01", "57P02", "57P03", "53300", "08000", "08001", "08003", "08004", "08006", "ECONNREFUSED", "ECONNRESET", "EPIPE", "ETIMEDOUT", "ENOTFOUND"]);
const UNAVAILABLE_MESSAGES = [/Connection terminated/i, /timeout exceeded when trying to connect/i, /Client has encountered a connection error/i, /Cannot use a pool after calling end/i, /Connection ended/i];

/** True when an error says the database is unreachable or restarting (answered 503, never 500). */
export function isDatabaseUnavailable(err: unknown): boolean {
  const d = driverError(err);
  if (d?.code && UNAVAILABLE_CODES.has(d.code)) return true;
  let e = err as PgLike | undefined;
  for (let i = 0; i < 4 && e; i++) {
    if (typeof e.message === "string" && UNAVAILABLE_MESSAGES.some((re) => re.test(e!.message!))) return true;
    e = e.cause as PgLike | undefined;
  }
  return false;
}

// Refusals a database trigger raises (drizzle/0001, 0004): "<code>: <sentence>".
const TRIGGER_REFUSALS: Record<string, string> = {
  record_signed: "Signed records are never changed or deleted; record a correction that supersedes it.",
  record_closed: "This record is closed and can no longer be changed; record a new one that refers to it.",
};

/** Body-parser and router refusals (http-errors `type`s) as the API's codes. */
const PARSER_ERRORS: Record<string, { status: number; code: string; message: string }> = {
  "entity.parse.failed": { status: 400, code: "invalid_json", message: "The request body is not valid JSON." },
  "entity.too.large": { status: 413, code: "too_large", message: "The request is too large." },
  "charset.unsupported": { status: 415, code: "unsupported_charset", message: "Send JSON encoded as UTF-8 (Content-Type: application/json; charset=utf-8)." },
  "encoding.unsupported": { status: 415, code: "unsupported_content_encoding", message: "The Content-Encoding is not one the server reads (send identity, gzip, deflate or br)." },
  "request.aborted": { status: 400, code: "request_aborted", message: "The request body ended before it was complete." },
  "request.size.invalid": { status: 400, code: "request_size_invalid", message: "The request body is not as long as its Content-Length says." },
  "stream.encoding.set": { status: 400, code: "invalid_body", message: "The request body could not be read." },
  "parameters.too.many": { status: 413, code: "too_large", message: "The request has too many parameters." },
};

/** Maps every error to the body of api.md; anything unexpected is a generic 500 with the detail only in the log. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const send = (status: number, code: string, message: string, details?: unknown) => sendError(res, status, code, message, details);

  if (err instanceof ZodError) {
    const first = err.issues[0];
    const where = first?.path?.length ? ` (${first.path.join(".")})` : "";
    return send(400, "invalid_input", `${first?.message ?? "Invalid input"}${where}`, err.issues);
  }
  if (err instanceof AppError) return send(err.status, err.code, err.message, err.details);
  if (typeof err?.type === "string" && PARSER_ERRORS[err.type]) {
    const p = PARSER_ERRORS[err.type];
    return send(p.status, p.code, p.message);
  }
  if (err?.code === "LIMIT_FILE_SIZE") return send(413, "file_too_large", "The file is too large.");
  // Express's router refuses a path whose percent-encoding is broken (/api/tools/%E0%A4%A) with a URIError.
  if (err instanceof URIError || (err?.status === 400 && /decode/i.test(String(err?.message)))) {
    return send(400, "malformed_url", "The address is not valid: a %-escape in it is broken.");
  }
  // The object store (AWS SDK errors carry $metadata): a missing file is 404, an unreachable store 503.
  if (err?.$metadata || err?.name === "NoSuchKey") {
    if (err?.name === "NoSuchKey" || err?.$metadata?.httpStatusCode === 404) return send(404, "file_not_found", "The stored file is missing.");
    req.log?.warn({ err }, "object storage unavailable");
    res.setHeader("Retry-After", "5");
    return send(503, "storage_unavailable", "File storage is not reachable right now; try again in a moment.");
  }
  if (isDatabaseUnavailable(err)) {
    req.log?.warn({ err }, "database unavailable");
    res.setHeader("Retry-After", "2");
    return send(503, "database_unavailable", "The database is not reachable right now (restarting or busy); nothing was changed. Try again in a few seconds.");
  }
  if (err instanceof SecondConnectionInTransactionError) {
    req.log?.error({ err }, "second connection inside a transaction");
    return send(500, "internal_error", "Something went wrong on the server; the error has been logged.");
  }
  // PostgreSQL: the database refused something the rules should have caught.
  const pg = driverError(err);
  const pgCode = pg?.code;
  if (pgCode === "P0001") {
    const code = Object.keys(TRIGGER_REFUSALS).find((c) => String(pg!.message).startsWith(c));
    if (code) return send(409, code, TRIGGER_REFUSALS[code]);
  }
  if (pgCode === "23505") return send(409, "duplicate", `That already exists (${pg!.constraint ?? "unique rule"}).`);
  if (pgCode === "23503") return send(409, "referenced_record_missing", "A record this refers to does not exist or is still in use.");
  if (pgCode === "23514") return send(400, "invalid_input", "A value is outside what the register accepts.");
  // Class 22 is "data exception": a value PostgreSQL cannot hold (NUL in text, numeric overflow, a date out of range…).
  if (pgCode?.startsWith("22")) return send(400, "invalid_input", "A value is not in a form the register accepts.");
  // Statement timeout, lock timeout, deadlock, serialization failure: transient, nothing was written.
  if (pgCode === "57014" || pgCode === "55P03" || pgCode === "40P01" || pgCode === "40001") {
    req.log?.warn({ err }, "database busy");
    res.setHeader("Retry-After", "2");
    return send(503, "database_busy", "The database is busy with other work; nothing was changed. Try again in a few seconds.");
  }
  // Any other 4xx raised by a middleware (http-errors with expose) keeps its status.
  if (typeof err?.status === "number" && err.status >= 400 && err.status < 500 && err.expose !== false) {
    return send(err.status, "bad_request", typeof err.message === "string" && err.expose ? err.message : "The request could not be read.");
  }
  req.log?.error({ err }, "unexpected error");
  return send(500, "internal_error", "Something went wrong on the server; the error has been logged.");
};

/** Writes the error body of api.md, unless an answer has already started. */
export function sendError(res: Response, status: number, code: string, message: string, details?: unknown) {
  if (res.headersSent) {
    res.end();
    return;
  }
  res.status(status).json({ error: { code, message, ...(details === undefined ? {} : { details }) } });
}
