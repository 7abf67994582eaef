import { Router } from "express";
import { z } from "zod";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { pageOf } from "../../../shared/common/lists.schemas";
import { CheckSheetSchema, CreateJobSchema, JobListQuerySchema, JobSummarySchema, SignerCertificateSchema, SignJobSchema } from "../../../shared/jobs/jobs.schemas";
import { jobsRepository } from "./jobs.repository";
import { jobsService } from "./jobs.service";
import { buildCheckSheet, toJobSummary } from "./check-sheet.service";
import { writeCheckSheetPdf } from "./check-sheet.pdf";
import { keptSheets, sendSheet } from "./kept-sheets";

const Id = z.string().uuid("Not a job id.");

export function jobsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "jobs");
  const service = jobsService(deps);
  const sheets = keptSheets();

  route(
    { method: "get", path: "/api/jobs", summary: "Jobs (filters engineSerial, status open/awaiting_signature/signed, mine), newest first", access: "signedIn", query: JobListQuerySchema, response: pageOf(JobSummarySchema) },
    async ({ query, user }) => {
      const { items, total } = await jobsRepository.list(deps.db, query, user.id);
      return { items: items.map(toJobSummary), total };
    },
  );

  route({ method: "post", path: "/api/jobs", summary: "Open a job on a limits table", access: "jobs.create", body: CreateJobSchema, response: JobSummarySchema }, ({ body, user }) =>
    service.create(body, user),
  );

  route(
    { method: "get", path: "/api/jobs/:id", summary: "The check sheet: items, readings, sizes, clearances, verdicts, flags, tools, sign-off", access: "signedIn", response: CheckSheetSchema },
    // Answered from a kept copy while nothing the sheet shows has changed (kept-sheets.ts).
    async ({ params, req, res }) => sendSheet(req, res, await sheets.answer(deps.db, Id.parse(params.id))),
  );

  route(
    { method: "get", path: "/api/me/inspector-certificate", summary: "My inspector certificate number, from my user record (the sign-off form fills it in)", access: "jobs.sign", response: SignerCertificateSchema },
    ({ user }) => service.signerCertificate(user),
  );

  route(
    { method: "post", path: "/api/jobs/:id/sign", summary: "Inspector sign-off with their own certificate number (409 certificate_not_yours otherwise); locks the sheet", access: "jobs.sign", body: SignJobSchema, response: CheckSheetSchema, status: 200 },
    ({ params, body, user }) => service.sign(Id.parse(params.id), body, user),
  );

  route(
    { method: "get", path: "/api/jobs/:id/check-sheet.pdf", summary: "The check sheet as a printable PDF", access: "signedIn", produces: "application/pdf" },
    async ({ params, res }) => {
      const sheet = await buildCheckSheet(deps.db, Id.parse(params.id));
      res.setHeader("Content-Type", "application/pdf");
      res.setHeader("Content-Disposition", `inline; filename="check-sheet-${sheet.engineSerial.replace(/[^A-Za-z0-9_-]/g, "_")}.pdf"`);
      res.end(await writeCheckSheetPdf(sheet, deps.clock.now(), deps.config.SHOP_TIME_ZONE));
    },
  );

  return router;
}
