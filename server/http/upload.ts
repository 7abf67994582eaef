import multer from "multer";
import type { NextFunction, Request, RequestHandler, Response } from "express";
import { can, type Permission } from "../../shared/auth/roles";
import type { SessionUser } from "./route";
import { AppError } from "./errors";

/**
 * Parses a multipart body with at most one file, in `field`, into memory (req.file). A file over
 * `maxBytes` reaches the error handler as 413 file_too_large; any other upload error becomes what
 * `badUpload` answers for it, or else a 400 saying what to send: a body the server cannot read is bad
 * input, never a server error.
 */
export function singleFileUpload(field: string, maxBytes: number, badUpload?: (err: unknown) => AppError | undefined) {
  const single = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1 } }).single(field);
  return (req: Request, res: Response, next: NextFunction) =>
    single(req, res, (err?: unknown) => {
      if (!err || (err instanceof multer.MulterError && err.code === "LIMIT_FILE_SIZE")) return next(err);
      next(badUpload?.(err) ?? new AppError("invalid_upload", 400, `The upload could not be read: send one file in the field "${field}".`));
    });
}

/** Multer's own refusals (unexpected field, too many files…), as opposed to a body it could not read at all. */
export const isMulterError = (err: unknown): err is multer.MulterError => err instanceof multer.MulterError;

/**
 * Runs an upload parser only for a signed-in person whose role may use the route; anyone else
 * falls through unread to the route, whose guard answers 401 or 403 — no stranger's file is read.
 */
export function uploadOnlyFor(permission: Permission, parse: RequestHandler): RequestHandler {
  return (req, res, next) => (can((req.user as SessionUser | undefined)?.role, permission) ? parse(req, res, next) : next());
}
