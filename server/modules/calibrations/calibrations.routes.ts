import { Router } from "express";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { pageOf } from "../../../shared/common/lists.schemas";
import {
  CalibrationListQuerySchema,
  CalibrationSchema,
  CertificateReviewSchema,
  ChainQuerySchema,
  ChainSchema,
  ConditionalResultSchema,
  ConditionalResultsQuerySchema,
  CreateCalibrationSchema,
  UploadedFileSchema,
} from "../../../shared/calibrations/calibrations.schemas";
import { calibrationsService } from "./calibrations.service";
import { uuidParam } from "../tools/register.common";
import { acceptFileUpload, sendStoredFile, uploadedFile } from "../tools/uploads";

export function calibrationsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "calibrations");
  const service = calibrationsService({ ...deps, defaultTimeZone: deps.config.SHOP_TIME_ZONE });

  route(
    {
      method: "post",
      path: "/api/tools/:assetTag/calibrations",
      summary: "Sign a calibration: points judged under the decision rule, result and next due date computed (409 standard_not_in_calibration)",
      access: "calibrations.write",
      body: CreateCalibrationSchema,
      response: CalibrationSchema,
    },
    ({ params, body, user }) => service.create(params.assetTag, body, user.id),
  );
  route(
    { method: "get", path: "/api/tools/:assetTag/calibrations", summary: "A tool's calibrations, newest first", access: "signedIn", query: CalibrationListQuerySchema, response: pageOf(CalibrationSchema) },
    ({ params, query }) => service.listForTool(params.assetTag, query),
  );
  route(
    { method: "get", path: "/api/tools/:assetTag/chain", summary: "Traceability chain: tool, calibration, standards, certificates, labs and accreditation, national institute", access: "signedIn", query: ChainQuerySchema, response: ChainSchema },
    ({ params, query }) => service.chain(params.assetTag, query.calibrationId),
  );

  // Registered before /api/calibrations/:id so "certificate-files" is never read as an id.
  const uploadPath = "/api/calibrations/certificate-files";
  acceptFileUpload(router, uploadPath, "calibrations.write");
  route(
    { method: "post", path: uploadPath, summary: "Upload a calibration certificate (PDF or image, multipart field file); sign the record with the fileKey answered", access: "calibrations.write", response: UploadedFileSchema },
    ({ req, user }) => service.uploadCertificate(uploadedFile(req), user.id),
  );

  // Also before /api/calibrations/:id.
  route(
    {
      method: "get",
      path: "/api/calibrations/conditional-results",
      summary: "As-found points within U of a limit (ILAC-G8 conditional pass / conditional fail), newest first, for the quality manager's review",
      access: "intervals.read",
      query: ConditionalResultsQuerySchema,
      response: pageOf(ConditionalResultSchema),
    },
    ({ query }) => service.conditionalResults(query),
  );

  route({ method: "get", path: "/api/calibrations/:id", summary: "One calibration record", access: "signedIn", response: CalibrationSchema }, ({ params }) => service.one(uuidParam(params.id)));
  route(
    { method: "post", path: "/api/calibrations/:id/review", summary: "Record the review of an outside lab's certificate (who, when, findings, accepted)", access: "calibrations.review", body: CertificateReviewSchema, response: CalibrationSchema },
    ({ params, body, user }) => service.review(uuidParam(params.id), body, user.id),
  );
  route({ method: "get", path: "/api/calibrations/:id/certificate", summary: "Download the calibration certificate file", access: "signedIn", produces: "application/pdf" }, async ({ params, res }) => {
    const f = await service.certificateFile(uuidParam(params.id));
    await sendStoredFile(res, deps.storage, f.key, f.fileName);
  });
  route(
    { method: "get", path: "/api/calibrations/:id/record.pdf", summary: "The signed calibration record as PDF, with each point's uncertainty budget", access: "signedIn", produces: "application/pdf" },
    async ({ params, res }) => {
      const { pdf, fileName } = await service.recordPdf(uuidParam(params.id));
      res.setHeader("Content-Type", "application/pdf");
      res.setHeader("Content-Disposition", `inline; filename="${fileName}"`);
      res.status(200).end(pdf);
    },
  );
  route({ method: "patch", path: "/api/calibrations/:id", summary: "Refused (409 record_signed): signed calibrations are never changed; supersede instead", access: "calibrations.write" }, ({ params }) =>
    service.refuseChange(uuidParam(params.id)),
  );
  route({ method: "delete", path: "/api/calibrations/:id", summary: "Refused (409 record_signed): signed calibrations are never deleted; supersede instead", access: "calibrations.write" }, ({ params }) =>
    service.refuseChange(uuidParam(params.id)),
  );
  return router;
}
