import { Router, type Request } from "express";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { CalibrationLabelsQuerySchema, CalibrationLabelsSchema, DoNotUseQuerySchema, DoNotUseTagSchema } from "../../../shared/checkouts/labels.schemas";
import { labelsService } from "./labels.service";
import { calibrationLabelsPdf, doNotUsePdf } from "./labels.pdf";

export function labelsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "labels");
  const service = labelsService(deps);
  // The QR codes point at the configured public address, or the one the request came in on.
  const origin = (req: Request) => deps.config.PUBLIC_URL ?? `${req.protocol}://${req.get("host")}`;

  route(
    { method: "get", path: "/api/labels/calibration.pdf", summary: "A sheet of calibration labels (30-up 2-5/8 × 1 in stock) with QR codes of each tool's status page", access: "labels.print", query: CalibrationLabelsQuerySchema, produces: "application/pdf" },
    async ({ query, req, res }) => {
      const labels = await service.calibrationLabels(query.assetTags, origin(req));
      const shop = await service.shop();
      const pdf = await calibrationLabelsPdf(labels, { skip: query.skip, shopName: shop.shopName, printedOn: shop.today });
      res.setHeader("Content-Type", "application/pdf");
      res.setHeader("Content-Disposition", `inline; filename="calibration-labels.pdf"`);
      res.end(pdf);
    },
  );

  route({ method: "get", path: "/api/labels/calibration", summary: "Calibration label contents for the print view", access: "labels.print", query: CalibrationLabelsQuerySchema, response: CalibrationLabelsSchema }, async ({ query, req }) => ({
    items: await service.calibrationLabels(query.assetTags, origin(req)),
  }));

  route(
    { method: "get", path: "/api/labels/do-not-use.pdf", summary: "A DO NOT USE tag for a tool that may not be used, with the reason", access: "labels.print", query: DoNotUseQuerySchema, produces: "application/pdf" },
    async ({ query, req, res, user }) => {
      const tag = await service.doNotUseTag(query.assetTag, origin(req), user.name);
      const pdf = await doNotUsePdf(tag, { shopName: (await service.shop()).shopName });
      res.setHeader("Content-Type", "application/pdf");
      res.setHeader("Content-Disposition", `inline; filename="do-not-use-${tag.assetTag}.pdf"`);
      res.end(pdf);
    },
  );

  route({ method: "get", path: "/api/labels/do-not-use", summary: "Do-not-use tag contents for the print view", access: "labels.print", query: DoNotUseQuerySchema, response: DoNotUseTagSchema }, async ({ query, req, user }) =>
    service.doNotUseTag(query.assetTag, origin(req), user.name),
  );

  return router;
}
