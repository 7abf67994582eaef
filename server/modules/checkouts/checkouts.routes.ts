import { Router, type NextFunction, type Request, type Response } from "express";
import { z } from "zod";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { AppError } from "../../http/errors";
import { isMulterError, singleFileUpload, uploadOnlyFor } from "../../http/upload";
import { pageOf } from "../../../shared/common/lists.schemas";
import {
  CheckoutListQuerySchema,
  CheckoutSchema,
  IssueResultSchema,
  IssueToolSchema,
  LostFoundResultSchema,
  LostFoundSchema,
  MyToolsSchema,
  ReturnResultSchema,
  ReturnToolSchema,
} from "../../../shared/checkouts/checkouts.schemas";
import { checkoutsService, type UploadedPhoto } from "./checkouts.service";

const Id = z.string().uuid("Not a checkout id.");
const PHOTO_LIMIT = 10 * 1024 * 1024;

/**
 * The return accepts JSON, or multipart with a `photo` file and the same
 * fields (`zeroCheck` as JSON text), so one schema validates both.
 */
function photoUpload() {
  const single = singleFileUpload("photo", PHOTO_LIMIT, (err) =>
    isMulterError(err) ? new AppError("invalid_input", 400, `The upload is not as expected: ${err.message}. Send one image in the field "photo".`) : undefined,
  );
  return uploadOnlyFor("checkouts.write", (req: Request, res: Response, next: NextFunction) => {
    if (!req.is("multipart/form-data")) return next();
    single(req, res, (err?: unknown) => {
      if (err) return next(err);
      const fields = (req.body ?? {}) as Record<string, string>;
      let zeroCheck: unknown = undefined;
      if (fields.zeroCheck) {
        try {
          zeroCheck = JSON.parse(fields.zeroCheck);
        } catch {
          zeroCheck = fields.zeroCheck; // left as text: the schema answers 400
        }
      }
      req.body = { condition: fields.condition, note: fields.note, ...(zeroCheck === undefined ? {} : { zeroCheck }) };
      next();
    });
  });
}

export function checkoutsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "checkouts");
  const service = checkoutsService(deps);

  route(
    {
      method: "post",
      path: "/api/checkouts",
      summary: "Issue a tool from the crib (409 tool_not_usable, already_checked_out or personal_tool; refusals are recorded)",
      access: "checkouts.write",
      body: IssueToolSchema,
      response: IssueResultSchema,
    },
    ({ body, user }) => service.issue(body, user.id),
  );

  route(
    { method: "get", path: "/api/checkouts", summary: "Checkouts; ?open=true is current custody (filters userId, overdue, assetTag, q)", access: "signedIn", query: CheckoutListQuerySchema, response: pageOf(CheckoutSchema) },
    ({ query }) => service.list(query),
  );

  route({ method: "get", path: "/api/checkouts/:id", summary: "One checkout", access: "signedIn", response: CheckoutSchema }, ({ params }) =>
    service.viewOne(Id.parse(params.id), deps.clock.now()),
  );

  route({ method: "get", path: "/api/checkouts/:id/photo", summary: "The photo taken when the tool came back", access: "signedIn", produces: "image/*" }, async ({ params, res }) => {
    const photo = await service.photo(Id.parse(params.id));
    res.setHeader("Content-Type", photo.contentType);
    res.setHeader("Cache-Control", "private, max-age=3600");
    res.end(photo.body);
  });

  router.post("/api/checkouts/:id/return", photoUpload());
  route(
    {
      method: "post",
      path: "/api/checkouts/:id/return",
      summary: "Return a tool: condition ok or damaged (damaged quarantines it), note, optional photo (multipart field photo) and zero check",
      access: "checkouts.write",
      body: ReturnToolSchema,
      response: ReturnResultSchema,
      status: 200,
    },
    ({ body, params, user, req }) => service.return(Id.parse(params.id), body, (req as Request & { file?: UploadedPhoto }).file, user.id),
  );

  route({ method: "get", path: "/api/me/tools", summary: "Tools issued to me and my own tools, each with status and due date", access: "signedIn", response: MyToolsSchema }, ({ user }) =>
    service.toolsOf(user.id),
  );

  route(
    { method: "post", path: "/api/tools/:assetTag/lost", summary: "Report a tool lost (opens an investigation; its checkout stays open)", access: "lifecycle.write", body: LostFoundSchema, response: LostFoundResultSchema, status: 200 },
    ({ body, params, user }) => service.markLost(params.assetTag, body.reason, user.id),
  );

  route(
    { method: "post", path: "/api/tools/:assetTag/found", summary: "A lost tool found again: back to active, held until a passing check or calibration", access: "lifecycle.write", body: LostFoundSchema, response: LostFoundResultSchema, status: 200 },
    ({ body, params, user }) => service.markFound(params.assetTag, body.reason, user.id),
  );

  return router;
}
