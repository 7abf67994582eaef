import { useQueryClient } from "@tanstack/react-query";
import { ApiError } from "../../../lib/api-client";
import type { CommitResult, DryRunResult, ImportMapping, ImportStreamLine } from "../../../../shared/transfers/transfers.schemas";

export type ImportStep = "dry-run" | "commit";
export interface ImportProgress {
  phase: "uploading" | "validating" | "importing";
  /** 0–1 */
  fraction: number;
}

async function csrfToken(): Promise<string> {
  const res = await fetch("/api/auth/csrf", { credentials: "same-origin" });
  return ((await res.json()) as { token: string }).token;
}

/**
 * Sends the CSV to the dry run or the import, reporting upload progress (XHR)
 * and then the server's own progress, streamed back as JSON lines.
 */
export async function sendImport<T extends DryRunResult | CommitResult>(
  step: ImportStep,
  file: File,
  opts: { mapping?: ImportMapping; createMissingFamilies: boolean },
  onProgress: (p: ImportProgress) => void,
): Promise<T> {
  const token = await csrfToken();
  const form = new FormData();
  form.append("file", file);
  if (opts.mapping) form.append("mapping", JSON.stringify(opts.mapping));
  form.append("createMissingFamilies", String(opts.createMissingFamilies));
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `/api/imports/${step}`);
    xhr.setRequestHeader("X-CSRF-Token", token);
    xhr.setRequestHeader("Accept", "application/x-ndjson");
    let seen = 0;
    let settled = false;
    const readLines = () => {
      const text = xhr.responseText;
      const end = text.lastIndexOf("\n");
      if (end < seen) return;
      for (const raw of text.slice(seen, end).split("\n")) {
        if (!raw.trim()) continue;
        let line: ImportStreamLine;
        try {
          line = JSON.parse(raw) as ImportStreamLine;
        } catch {
          continue;
        }
        if ("progress" in line) onProgress({ phase: line.progress.phase, fraction: line.progress.total ? line.progress.done / line.progress.total : 1 });
        else if ("result" in line) {
          settled = true;
          resolve(line.result as T);
        } else if ("error" in line) {
          settled = true;
          reject(new ApiError(400, line.error.code, line.error.message, line.error.details));
        }
      }
      seen = end + 1;
    };
    xhr.upload.onprogress = (e) => e.lengthComputable && onProgress({ phase: "uploading", fraction: e.loaded / e.total });
    xhr.onprogress = readLines;
    xhr.onload = () => {
      if (xhr.status >= 200 && xhr.status < 300) {
        readLines();
        if (!settled) reject(new ApiError(xhr.status, "no_result", "The server ended the answer without a result; nothing may have been imported. Try again."));
        return;
      }
      try {
        const body = JSON.parse(xhr.responseText) as { error: { code: string; message: string; details?: unknown } };
        reject(new ApiError(xhr.status, body.error.code, body.error.message, body.error.details));
      } catch {
        reject(new ApiError(xhr.status, `http_${xhr.status}`, `The server answered ${xhr.status}.`));
      }
    };
    xhr.onerror = () => reject(new ApiError(0, "network", "The upload did not reach the server; check the connection and try again."));
    xhr.send(form);
  });
}

/** After an import: the register, families, dashboards and the audit trail changed. */
export function useAfterImport() {
  const qc = useQueryClient();
  return () => {
    for (const key of [["tools"], ["families"], ["stats"], ["intervals"], ["audit"]]) qc.invalidateQueries({ queryKey: key });
  };
}
