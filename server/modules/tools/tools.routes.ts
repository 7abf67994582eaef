import { Router } from "express";
import { z } from "zod";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import type { QuickGet } from "../../http/quick-get";
import {
  CreateToolSchema,
  LifecycleChangeSchema,
  QuarantineSchema,
  RejectElementSchema,
  ReleaseSchema,
  SetElementSchema,
  ToolActionResultSchema,
  ToolDetailSchema,
  ToolListQuerySchema,
  ToolLocationsSchema,
  ToolStatusQuerySchema,
  ToolStatusResponseSchema,
  ToolPageSchema,
  UpdateToolSchema,
} from "../../../shared/tools/tools.schemas";
import { toolsService } from "./tools.service";
import { uuidParam } from "./register.common";
import { acceptFileUpload, sendStoredFile, uploadedFile } from "./uploads";

/**
 * A tool's status now, as a quick GET (server/http/quick-get.ts): the same service call as GET
 * /api/tools/:assetTag/status below, taken when there is no query string and the caches know the session.
 */
export function toolsQuickGets(deps: AppDeps): QuickGet[] {
  const service = toolsService({ ...deps, defaultTimeZone: deps.config.SHOP_TIME_ZONE });
  return [{ pattern: /^\/api\/tools\/([^/?#]+)\/status$/, answer: ([assetTag]) => service.status(assetTag) }];
}

export function toolsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "tools");
  const service = toolsService({ ...deps, defaultTimeZone: deps.config.SHOP_TIME_ZONE });

  route(
    {
      method: "get",
      path: "/api/tools",
      summary: "The register: filter (status, family, kind, q, custodian, location, owner, dueWithinDays, dueFrom/dueTo), sort, page; ?format=csv exports the current view (all pages)",
      access: "signedIn",
      query: ToolListQuerySchema,
      response: ToolPageSchema,
    },
    async ({ query, res }) => {
      if (query.format !== "csv") return service.list(query);
      const csv = await service.csv(query);
      res.setHeader("Content-Type", "text/csv; charset=utf-8");
      res.setHeader("Content-Disposition", `attachment; filename="tenthwise-register-${deps.clock.now().toISOString().slice(0, 10)}.csv"`);
      res.status(200).send(csv);
    },
  );
  // Before /api/tools/:assetTag, so "locations" is never read as a tag.
  route({ method: "get", path: "/api/tools/locations", summary: "Every location named in the register, once each: the choices of the location filter", access: "signedIn", response: ToolLocationsSchema }, () =>
    service.locations(),
  );
  route({ method: "post", path: "/api/tools", summary: "Register a tool (with the elements of a set)", access: "tools.write", body: CreateToolSchema, response: ToolDetailSchema }, ({ body, user }) =>
    service.create(body, user.id),
  );
  route({ method: "get", path: "/api/tools/:assetTag", summary: "One tool with its status, custody, last calibration, family and elements", access: "signedIn", response: ToolDetailSchema }, ({ params }) =>
    service.detail(params.assetTag),
  );
  route(
    { method: "patch", path: "/api/tools/:assetTag", summary: "Change a tool's details that are not evidence (description, maker, location, owner, interval…)", access: "tools.write", body: UpdateToolSchema, response: ToolDetailSchema, status: 200 },
    ({ params, body, user }) => service.update(params.assetTag, body, user.id),
  );
  route(
    { method: "get", path: "/api/tools/:assetTag/status", summary: "May this tool be used, and why not? At an instant (?at=ISO, default now)", access: "signedIn", query: ToolStatusQuerySchema, response: ToolStatusResponseSchema },
    ({ params, query }) => service.status(params.assetTag, query.at),
  );
  route({ method: "post", path: "/api/tools/:assetTag/quarantine", summary: "Quarantine a tool with a reason", access: "holds.write", body: QuarantineSchema, response: ToolActionResultSchema, status: 200 }, ({ params, body, user }) =>
    service.quarantine(params.assetTag, body.reason, user.id),
  );
  route(
    { method: "post", path: "/api/tools/:assetTag/release", summary: "Release a quarantine with a reason (409 calibration_required when found out of tolerance)", access: "holds.write", body: ReleaseSchema, response: ToolActionResultSchema, status: 200 },
    ({ params, body, user }) => service.release(params.assetTag, body.reason, user.id),
  );
  route(
    { method: "post", path: "/api/tools/:assetTag/lifecycle", summary: "Mark a tool inactive, active again, or retired, with a reason", access: "lifecycle.write", body: LifecycleChangeSchema, response: ToolActionResultSchema, status: 200 },
    ({ params, body, user }) => service.changeLifecycle(params.assetTag, body, user.id),
  );
  route({ method: "get", path: "/api/tools/:assetTag/elements", summary: "Elements of a set (feeler leaves, gauge blocks)", access: "signedIn", response: z.array(SetElementSchema) }, ({ params }) =>
    service.elements(params.assetTag),
  );
  route(
    { method: "post", path: "/api/tools/:assetTag/elements/:elementId/reject", summary: "Reject one element of a set; it cannot be chosen again", access: "tools.write", body: RejectElementSchema, response: SetElementSchema, status: 200 },
    ({ params, body, user }) => service.rejectElement(params.assetTag, uuidParam(params.elementId), body.reason, user.id),
  );
  const photoPath = "/api/tools/:assetTag/photo";
  acceptFileUpload(router, photoPath, "tools.write");
  route({ method: "post", path: photoPath, summary: "Upload the tool's photo (image, multipart field file)", access: "tools.write", response: ToolDetailSchema, status: 200 }, ({ params, req, user }) =>
    service.attachPhoto(params.assetTag, uploadedFile(req), user.id),
  );
  route({ method: "get", path: photoPath, summary: "The tool's photo", access: "signedIn", produces: "image/jpeg" }, async ({ params, res }) => {
    const f = await service.photo(params.assetTag);
    await sendStoredFile(res, deps.storage, f.key, f.fileName);
  });
  return router;
}
