import { Router, type Request, type Response } from "express";
import { ZodError } from "zod";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { AppError } from "../../http/errors";
import { singleFileUpload, uploadOnlyFor } from "../../http/upload";
import { decodeCsv, transfersService, type Progress } from "./transfers.service";
import { CommitResultSchema, DryRunResultSchema, ImportRequestSchema, type ImportStreamLine } from "../../../shared/transfers/transfers.schemas";
import { calendarDate } from "../../../shared/common/dates";

// A malformed upload is bad input, never a server fault.
const upload = singleFileUpload("file", 20 * 1024 * 1024, () => new AppError("invalid_upload", 400, "The upload could not be read: send one CSV file in the field “file”."));

/** The CSV text of a request: an uploaded file (checked for UTF-8) or the `csv` field. */
function csvText(req: Request, csv: string | undefined): string {
  if (req.file) return decodeCsv(req.file.buffer);
  if (csv !== undefined) return csv.replace(/^\uFEFF/, "");
  throw new AppError("csv_missing", 400, "Attach the CSV file (field “file”) or send its text as “csv”.");
}

/**
 * With `Accept: application/x-ndjson` the answer streams one JSON line per
 * progress step and ends with the result (or the error), so a large file shows
 * the server's progress; otherwise it is one JSON answer.
 */
async function answer<T>(req: Request, res: Response, work: (progress?: Progress) => Promise<T>): Promise<T | undefined> {
  if (!String(req.headers.accept ?? "").includes("application/x-ndjson")) return work();
  res.status(200).setHeader("Content-Type", "application/x-ndjson; charset=utf-8");
  res.setHeader("Cache-Control", "no-store");
  const line = (l: ImportStreamLine) => res.write(JSON.stringify(l) + "\n");
  let last = 0;
  try {
    const result = await work((p) => {
      // About a hundred progress lines at most, whatever the file's size.
      if (p.done === p.total || p.done - last >= Math.max(1, Math.floor(p.total / 100))) {
        last = p.done;
        line({ progress: p });
      }
    });
    line({ result: result as never });
  } catch (e) {
    const err =
      e instanceof AppError
        ? { code: e.code, message: e.message, details: e.details }
        : e instanceof ZodError
          ? { code: "invalid_input", message: e.issues[0]?.message ?? "Invalid input", details: e.issues }
          : { code: "internal_error", message: "Something went wrong on the server; nothing was imported." };
    if (!(e instanceof AppError) && !(e instanceof ZodError)) req.log?.error({ err: e }, "import failed");
    line({ error: err });
  }
  res.end();
  return undefined;
}

export function transfersRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "transfers");
  const service = transfersService({ db: deps.db, clock: deps.clock, timeZone: deps.config.SHOP_TIME_ZONE });

  const guardAndParse = uploadOnlyFor("import.run", upload);
  router.post("/api/imports/dry-run", guardAndParse);
  router.post("/api/imports/commit", guardAndParse);

  route(
    {
      method: "post",
      path: "/api/imports/dry-run",
      summary: "Check a register CSV (multipart “file”, or “csv” text) row by row and propose a column mapping; writes nothing",
      access: "import.run",
      body: ImportRequestSchema,
      response: DryRunResultSchema,
      status: 200,
    },
    ({ body, req, res }) => answer(req, res, (p) => service.dryRun(csvText(req, body.csv), body.mapping, body.createMissingFamilies, p)),
  );

  route(
    {
      method: "post",
      path: "/api/imports/commit",
      summary: "Import a register CSV in one transaction: every row or none (400 import_rows_invalid lists the rows)",
      access: "import.run",
      body: ImportRequestSchema,
      response: CommitResultSchema,
    },
    ({ body, user, req, res }) => answer(req, res, (p) => service.commit(csvText(req, body.csv), body.mapping, body.createMissingFamilies, user.id, p)),
  );

  const csvHeaders = (res: Response, name: string) => {
    res.status(200);
    res.setHeader("Content-Type", "text/csv; charset=utf-8");
    res.setHeader("Content-Disposition", `attachment; filename="${name}-${calendarDate(deps.clock.now(), deps.config.SHOP_TIME_ZONE)}.csv"`);
    // A byte-order mark so spreadsheets open the file as UTF-8.
    res.write("\uFEFF");
  };

  route(
    { method: "get", path: "/api/exports/register.csv", summary: "The whole register as CSV: tools with derived status, due date, custody and last calibration", access: "signedIn", produces: "text/csv" },
    async ({ res }) => {
      csvHeaders(res, "tenthwise-register");
      await service.exportRegister(res);
    },
  );

  route(
    { method: "get", path: "/api/exports/history.csv", summary: "Every calibration record with its points as CSV (one line per point), for an auditor", access: "signedIn", produces: "text/csv" },
    async ({ res }) => {
      csvHeaders(res, "tenthwise-calibration-history");
      await service.exportHistory(res);
    },
  );

  return router;
}
