import type { ErrorRequestHandler } from "express";
import { ZodError } from "zod";
import { AppError } from "./errors";

/** Maps every error to the body of api.md; anything unexpected is a generic 500 with the detail only in the log. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const send = (status: number, code: string, message: string, details?: unknown) =>
    res.status(status).json({ error: { code, message, ...(details === undefined ? {} : { details }) } });

  if (err instanceof ZodError) {
    const first = err.issues[0];
    const where = first?.path?.length ? ` (${first.path.join(".")})` : "";
    return send(400, "invalid_input", `${first?.message ?? "Invalid input"}${where}`, err.issues);
  }
  if (err instanceof AppError) return send(err.status, err.code, err.message, err.details);
  if (err?.type === "entity.parse.failed") return send(400, "invalid_json", "The request body is not valid JSON.");
  if (err?.type === "entity.too.large") return send(413, "too_large", "The request is too large.");
  if (err?.code === "LIMIT_FILE_SIZE") return send(413, "file_too_large", "The file is too large.");
  // PostgreSQL: the database refused something the rules should have caught.
  // Drizzle wraps driver errors; the PostgreSQL error is then its cause.
  if (err?.cause?.code && !err?.code) err = err.cause;
  const pgCode = err?.code as string | undefined;
  if (pgCode === "P0001" && String(err.message).startsWith("record_signed")) {
    return send(409, "record_signed", "Signed records are never changed or deleted; record a correction that supersedes it.");
  }
  if (pgCode === "23505") return send(409, "duplicate", `That already exists (${err.constraint ?? "unique rule"}).`);
  if (pgCode === "22P02" || pgCode === "22003" || pgCode === "22007" || pgCode === "22008") {
    return send(400, "invalid_input", "A value is not in a form the register accepts.");
  }
  if (pgCode === "23503") return send(409, "referenced_record_missing", "A record this refers to does not exist or is still in use.");
  req.log?.error({ err }, "unexpected error");
  return send(500, "internal_error", "Something went wrong on the server; the error has been logged.");
};
