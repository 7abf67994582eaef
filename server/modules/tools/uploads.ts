import type { Request, Response, Router } from "express";
import type { Permission } from "../../../shared/auth/roles";
import { AppError } from "../../http/errors";
import type { ObjectStorage } from "../../platform/storage";
import { singleFileUpload, uploadOnlyFor } from "../../http/upload";

export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;
const upload = singleFileUpload("file", MAX_UPLOAD_BYTES);

/** Certificates and photos: PDF or a common image, recognised by their first bytes, not by what the browser claims. */
const SIGNATURES: { type: string; test: (b: Buffer) => boolean }[] = [
  { type: "application/pdf", test: (b) => b.subarray(0, 5).toString("latin1") === "%PDF-" },
  { type: "image/png", test: (b) => b.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) },
  { type: "image/jpeg", test: (b) => b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff },
  { type: "image/webp", test: (b) => b.subarray(0, 4).toString("latin1") === "RIFF" && b.subarray(8, 12).toString("latin1") === "WEBP" },
];

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
  const kind = SIGNATURES.find((s) => s.test(f.buffer));
  if (!kind) throw new AppError("unsupported_file_type", 400, "Upload a PDF or an image (PNG, JPEG or WebP).");
  return { buffer: f.buffer, fileName: f.originalname || "file", contentType: kind.type, size: f.size };
}

/** Answers a stored file (certificate, photo) for viewing in the browser. */
export async function sendStoredFile(res: Response, storage: ObjectStorage, key: string, fileName: string) {
  const obj = await storage.get(key);
  res.setHeader("Content-Type", obj.contentType);
  res.setHeader("Content-Disposition", `inline; filename="${fileName.replace(/[^A-Za-z0-9._-]+/g, "_")}"`);
  res.setHeader("Cache-Control", "private, max-age=300");
  res.status(200).end(obj.body);
}
