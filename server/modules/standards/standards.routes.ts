import { Router } from "express";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { pageOf } from "../../../shared/common/lists.schemas";
import { AddCertificateSchema, CertificateSchema, CreateStandardSchema, StandardDetailSchema, StandardListQuerySchema, StandardSchema } from "../../../shared/standards/standards.schemas";
import { standardsService } from "./standards.service";
import { uuidParam } from "../tools/register.common";
import { acceptFileUpload, sendStoredFile, uploadedFile } from "../tools/uploads";

export function standardsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "standards");
  const service = standardsService({ ...deps, defaultTimeZone: deps.config.SHOP_TIME_ZONE });

  route({ method: "get", path: "/api/standards", summary: "List reference standards with the certificate in force", access: "signedIn", query: StandardListQuerySchema, response: pageOf(StandardSchema) }, ({ query }) =>
    service.list(query),
  );
  route({ method: "post", path: "/api/standards", summary: "Register a reference standard with its certificate", access: "standards.write", body: CreateStandardSchema, response: StandardDetailSchema }, ({ body, user }) =>
    service.create(body, user.id),
  );
  route({ method: "get", path: "/api/standards/:id", summary: "One reference standard with every certificate", access: "signedIn", response: StandardDetailSchema }, ({ params }) =>
    service.detail(uuidParam(params.id)),
  );
  route(
    { method: "post", path: "/api/standards/:id/certificates", summary: "Add a new certificate after the standard's recalibration", access: "standards.write", body: AddCertificateSchema, response: CertificateSchema },
    ({ params, body, user }) => service.addCertificate(uuidParam(params.id), body, user.id),
  );
  const filePath = "/api/standards/:id/certificates/:certificateId/file";
  acceptFileUpload(router, filePath, "standards.write");
  route(
    { method: "post", path: filePath, summary: "Upload the certificate file (PDF or image, multipart field file)", access: "standards.write", response: CertificateSchema },
    ({ params, req, user }) => service.attachCertificateFile(uuidParam(params.id), uuidParam(params.certificateId), uploadedFile(req), user.id),
  );
  route({ method: "get", path: filePath, summary: "Download the certificate file", access: "signedIn", produces: "application/pdf" }, async ({ params, res }) => {
    const f = await service.certificateFile(uuidParam(params.id), uuidParam(params.certificateId));
    await sendStoredFile(res, deps.storage, f.key, f.fileName);
  });
  return router;
}
