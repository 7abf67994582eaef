import type { Request, Response, Router } from "express";
import type { Permission } from "../../../shared/auth/roles";
import { AppError } from "../../http/errors";
import type { ObjectStorage } from "../../platform/storage";
import { singleFileUpload, sniffFileType, uploadOnlyFor } from "../../http/upload";

export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;
const upload = singleFileUpload("file", MAX_UPLOAD_BYTES);

/**
 * Parses a multipart body with one file in field "file" (memory storage) for a
 * route declared next with defineRoutes; the role is checked before the upload is read.
 */
export function acceptFileUpload(router: Router, path: string, permission: Permission) {
  router.post(path, uploadOnlyFor(permission, upload));
}

/** The uploaded file with its recognised content type; 400 when missing or not a PDF/image. */
export function uploadedFile(req: Request): { buffer: Buffer; fileName: string; contentType: string; size: number } {
  const f = req.file;
  if (!f || f.size === 0) throw new AppError("file_required", 400, "Attach the file (PDF or image) in the field named file.");
  // Recognised by the first bytes, not by what the browser claims.
  const type = sniffFileType(f.buffer);
  if (!type || type === "image/heic") throw new AppError("unsupported_file_type", 400, "Upload a PDF or an image (PNG, JPEG or WebP).");
  return { buffer: f.buffer, fileName: f.originalname || "file", contentType: type, size: f.size };
}

/** Answers a stored file (certificate, photo) for viewing in the browser. */
export async function sendStoredFile(res: Response, storage: ObjectStorage, key: string, fileName: string) {
  const obj = await storage.get(key);
  res.setHeader("Content-Type", obj.contentType);
  res.setHeader("Content-Disposition", `inline; filename="${fileName.replace(/[^A-Za-z0-9._-]+/g, "_")}"`);
  res.setHeader("Cache-Control", "private, max-age=300");
  res.status(200).end(obj.body);
}
