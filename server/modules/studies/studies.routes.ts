import { Router } from "express";
import { z } from "zod";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { getSettings } from "../settings/settings.service";
import { pageOf } from "../../../shared/common/lists.schemas";
import {
  CreateStudySchema,
  LatestStudiesQuerySchema,
  LatestStudySchema,
  MyStudySchema,
  RecordStudyValueResultSchema,
  RecordStudyValueSchema,
  StudyDetailSchema,
  StudyGapsSchema,
  StudyListQuerySchema,
  StudySessionSchema,
  StudySummarySchema,
  SupersedeStudyValueSchema,
} from "../../../shared/studies/studies.schemas";
import { studiesService } from "./studies.service";
import { writeStudyPdf } from "./studies.pdf";

const Id = z.string().uuid("Not a study id.");
const ValueId = z.string().uuid("Not a study value id.");

export function studiesRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "studies");
  const service = studiesService(deps);

  route(
    { method: "get", path: "/api/studies", summary: "Gauge studies, newest first (filters state, familyId, limitTableId with itemKey)", access: "studies.read", query: StudyListQuerySchema, response: pageOf(StudySummarySchema) },
    ({ query }) => service.list(query),
  );

  route(
    {
      method: "post",
      path: "/api/studies",
      summary: "Set up a gauge study (crossed): a journal or bore characteristic, a tool or family, 5–10 labelled parts, 2–3 mechanics as appraisers, 2–3 trials; the randomized run order is drawn and kept",
      access: "studies.write",
      body: CreateStudySchema,
      response: StudyDetailSchema,
    },
    ({ body, user }) => service.create(body, user),
  );

  // Declared before /api/studies/:id so the words are not read as ids.
  route({ method: "get", path: "/api/studies/mine", summary: "Studies waiting for me as an appraiser, with my progress", access: "studies.take", response: z.array(MyStudySchema) }, ({ user }) => service.mine(user));

  route(
    { method: "get", path: "/api/studies/latest", summary: "Latest finished study and its verdict (and any in progress) per characteristic and tool family: by familyId or by limitTableId", access: "signedIn", query: LatestStudiesQuerySchema, response: z.array(LatestStudySchema) },
    ({ query }) => service.latest(query),
  );

  route(
    { method: "get", path: "/api/studies/gaps", summary: "Characteristics of current limits tables with no finished study, or whose studied tool families are all not acceptable", access: "signedIn", response: StudyGapsSchema },
    () => service.gaps(),
  );

  route({ method: "get", path: "/api/studies/:id", summary: "One study: set-up, run order, every value (corrections too), results of both methods and chart data", access: "studies.read", response: StudyDetailSchema }, ({ params }) =>
    service.get(Id.parse(params.id)),
  );

  route(
    { method: "get", path: "/api/studies/:id/report.pdf", summary: "The study report as PDF, with the range, average, interaction and components charts", access: "studies.read", produces: "application/pdf" },
    async ({ params, res }) => {
      const study = await service.get(Id.parse(params.id));
      const settings = await getSettings(deps.db, deps.config.SHOP_TIME_ZONE);
      const pdf = await writeStudyPdf(study, deps.clock.now(), settings.shopTimeZone);
      res.setHeader("Content-Type", "application/pdf");
      res.setHeader("Content-Disposition", `inline; filename="gauge-study-${study.reference}.pdf"`);
      res.status(200).end(pdf);
    },
  );

  route(
    { method: "get", path: "/api/studies/:id/session", summary: "The appraiser's next prompt (part and trial), blind: no earlier value is shown but the one just entered", access: "studies.take", response: StudySessionSchema },
    ({ params, user }) => service.session(Id.parse(params.id), user),
  );

  route(
    {
      method: "post",
      path: "/api/studies/:id/values",
      summary: "Record the value for the prompt shown (refused out of order), with the tool used, checked for usability as for any reading",
      access: "studies.take",
      body: RecordStudyValueSchema,
      response: RecordStudyValueResultSchema,
    },
    ({ params, body, user }) => service.record(Id.parse(params.id), body, user),
  );

  route(
    {
      method: "post",
      path: "/api/study-values/:id/supersede",
      summary: "Correct one's own study value: a new value supersedes it, with the reason; the old one stays on record",
      access: "studies.take",
      body: SupersedeStudyValueSchema,
      response: RecordStudyValueResultSchema,
    },
    ({ params, body, user }) => service.supersede(ValueId.parse(params.id), body, user),
  );

  return router;
}
