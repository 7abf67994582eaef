import { Router } from "express";
import { z } from "zod";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { getSettings } from "../settings/settings.service";
import {
  AffectedItemsPageSchema,
  AffectedItemsQuerySchema,
  CloseInvestigationSchema,
  RemeasureCandidatesSchema,
  CreateDispositionResultSchema,
  CreateDispositionSchema,
  InvestigationDetailSchema,
  InvestigationListQuerySchema,
  InvestigationListSchema,
  StandardFindingResultSchema,
  StandardFindingSchema,
} from "../../../shared/investigations/investigations.schemas";
import { addDispositions, allItems, assertGathered, closeInvestigation, getInvestigation, listInvestigations, listItems, openStandardInvestigation, remeasureCandidates } from "./investigations.service";
import { writeInvestigationPdf } from "./investigations.pdf";

const Id = z.string().uuid("Not a valid id.");

export function investigationsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "investigations");
  const findingDeps = { clock: deps.clock, mailer: deps.mailer, timeZone: deps.config.SHOP_TIME_ZONE };

  route(
    {
      method: "get",
      path: "/api/investigations",
      summary:
        "Out-of-tolerance investigations, open first then newest, as an array (api.md). Filters: toolAssetTag (the tool, the standard, or a tool carried in by a cascade), " +
        "status, jobId (investigations touching a job's readings, for the check sheet's banner). page/pageSize limit the array; the total is in the X-Total-Count header.",
      access: "signedIn",
      query: InvestigationListQuerySchema,
      response: InvestigationListSchema,
    },
    async ({ query, res }) => {
      const { items, total } = await listInvestigations(deps.db, query);
      res.setHeader("X-Total-Count", String(total));
      return items;
    },
  );

  route(
    {
      method: "get",
      path: "/api/investigations/:id",
      summary: "One investigation: the finding, the window, totals of its affected items by verdict and the check sheets they belong to (the items are paged: /items)",
      access: "signedIn",
      response: InvestigationDetailSchema,
    },
    async ({ params }) => getInvestigation(deps.db, Id.parse(params.id)),
  );

  route(
    {
      method: "get",
      path: "/api/investigations/:id/items",
      summary:
        "A page of an investigation's affected items, each re-judged with its dispositions. Sorted on the server (sort=couldChange|sheet|takenAt|item|tool|verdict|margin|disposition, '-' for descending; " +
        "by default could-change first, then by check sheet and time); filters couldChange, verdict, disposition (a kind, or none), jobId and q (place, engine, work order, tool); totals by verdict over the filter.",
      access: "signedIn",
      query: AffectedItemsQuerySchema,
      response: AffectedItemsPageSchema,
    },
    async ({ params, query }) => listItems(deps.db, Id.parse(params.id), query),
  );

  route(
    {
      method: "get",
      path: "/api/investigations/:id/items/:itemId/remeasure-candidates",
      summary: "The later readings of an affected reading's place on the same check sheet, newest first: what its remeasurement can be",
      access: "signedIn",
      response: RemeasureCandidatesSchema,
    },
    async ({ params }) => remeasureCandidates(deps.db, Id.parse(params.id), Id.parse(params.itemId)),
  );

  route(
    { method: "get", path: "/api/investigations/:id/report.pdf", summary: "The investigation report as PDF", access: "signedIn", produces: "application/pdf" },
    async ({ params, res }) => {
      const inv = await getInvestigation(deps.db, Id.parse(params.id));
      assertGathered(inv);
      const settings = await getSettings(deps.db, deps.config.SHOP_TIME_ZONE);
      const pdf = await writeInvestigationPdf(inv, allItems(deps.db, inv.id), deps.clock.now(), settings.shopTimeZone);
      res.setHeader("Content-Type", "application/pdf");
      res.setHeader("Content-Disposition", `inline; filename="investigation-${inv.toolAssetTag ?? inv.id}-${inv.openedAt.slice(0, 10)}.pdf"`);
      res.status(200).end(pdf);
    },
  );

  route(
    {
      method: "post",
      path: "/api/investigations/:id/dispositions",
      summary:
        "Record a disposition (no_impact, remeasure, notify_owner, recall) with its rationale for some affected items (the table's selected rows) or a whole job, all or none. " +
        "An item that already has one gets a new disposition superseding it; the old one is kept. A remeasurement names a later reading of the same place on the same sheet.",
      access: "dispositions.write",
      body: CreateDispositionSchema,
      response: CreateDispositionResultSchema,
    },
    async ({ params, body, user }) => addDispositions(deps.db, deps.clock, Id.parse(params.id), body, user),
  );

  route(
    {
      method: "post",
      path: "/api/investigations/:id/close",
      summary: "Close an investigation with a summary; refused (dispositions_missing) while an affected item has no disposition",
      access: "investigations.close",
      body: CloseInvestigationSchema,
      status: 200,
    },
    async ({ params, body, user }) => closeInvestigation(deps.db, deps.clock, Id.parse(params.id), body.summary, user.id),
  );

  route(
    {
      method: "post",
      path: "/api/standards/:id/findings",
      summary: "Record a finding on a reference standard (errors found at its recalibration); opens the cascade investigation",
      access: "calibrations.write",
      body: StandardFindingSchema,
      response: StandardFindingResultSchema,
    },
    async ({ params, body, user }) =>
      openStandardInvestigation(deps.db, findingDeps, { standardId: Id.parse(params.id), foundAt: new Date(body.foundAt), errors: body.errors, note: body.note, actorId: user.id }),
  );

  return router;
}
