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

/** File types the register keeps, recognised by their first bytes (never by the name or the declared type). */
const SIGNATURES: { type: string; test: (b: Buffer) => boolean }[] = [
  { type: "application/pdf", test: (b) => b.subarray(0, 5).toString("latin1") === "%PDF-" },
  { type: "image/png", test: (b) => b.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) },
  { type: "image/jpeg", test: (b) => b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff },
  { type: "image/webp", test: (b) => b.subarray(0, 4).toString("latin1") === "RIFF" && b.subarray(8, 12).toString("latin1") === "WEBP" },
  // ISO BMFF (ISO/IEC 14496-12) "ftyp" box with a HEIF brand (ISO/IEC 23008-12): phone photos.
  { type: "image/heic", test: (b) => b.subarray(4, 8).toString("latin1") === "ftyp" && ["heic", "heix", "hevc", "heim", "heis", "mif1", "msf1"].includes(b.subarray(8, 12).toString("latin1")) },
];

/** The content type the bytes really are, or null when they are none of PDF, PNG, JPEG, WebP, HEIC. */
export function sniffFileType(bytes: Buffer): string | null {
  return SIGNATURES.find((s) => s.test(bytes))?.type ?? null;
}
