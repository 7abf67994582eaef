import { Router } from "express";
import { z } from "zod";
import type { AppDeps } from "../../app-deps";
import { defineRoutes } from "../../http/route";
import { pageOf } from "../../../shared/common/lists.schemas";
import {
  CreateShipmentSchema,
  LabOptionSchema,
  ReceiveShipmentSchema,
  ShipmentListQuerySchema,
  ShipmentSchema,
  ShipmentsCreatedSchema,
} from "../../../shared/shipments/shipments.schemas";
import { shipmentsService } from "./shipments.service";

const Id = z.string().uuid("Not a shipment id.");

export function shipmentsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "shipments");
  const service = shipmentsService(deps);

  route(
    {
      method: "post",
      path: "/api/shipments",
      summary: "Ship one or several tools to an outside calibration lab (refused if any is out with a person or already away)",
      access: "shipments.write",
      body: CreateShipmentSchema,
      response: ShipmentsCreatedSchema,
    },
    ({ body, user }) => service.ship(body, user.id),
  );

  route(
    { method: "post", path: "/api/shipments/:id/receive", summary: "A tool back from the lab; record its calibration from the certificate next", access: "shipments.write", body: ReceiveShipmentSchema, response: ShipmentSchema, status: 200 },
    ({ body, params, user }) => service.receive(Id.parse(params.id), body, user.id),
  );

  route({ method: "get", path: "/api/shipments", summary: "Shipments to outside labs; ?open=true lists tools still away", access: "signedIn", query: ShipmentListQuerySchema, response: pageOf(ShipmentSchema) }, ({ query }) =>
    service.list(query),
  );

  route({ method: "get", path: "/api/shipments/labs", summary: "Outside labs to ship to", access: "signedIn", response: z.object({ items: z.array(LabOptionSchema) }) }, async () => ({
    items: await service.labs(),
  }));

  return router;
}
