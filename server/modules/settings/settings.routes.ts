import { Router } from "express";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { forgetCachedSettings, getSettings, updateSettings } from "./settings.service";
import { SettingsSchema, UpdateSettingsSchema } from "../../../shared/settings/settings.schemas";

export function settingsRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "settings");
  route({ method: "get", path: "/api/settings", summary: "Shop settings", access: "signedIn", response: SettingsSchema }, () => getSettings(deps.db, deps.config.SHOP_TIME_ZONE));
  route({ method: "patch", path: "/api/settings", summary: "Change shop settings", access: "settings.write", body: UpdateSettingsSchema, response: SettingsSchema, status: 200 }, ({ body, user }) =>
    deps.db.transaction((tx) => updateSettings(tx, deps.config.SHOP_TIME_ZONE, body, user.id)).finally(forgetCachedSettings),
  );
  return router;
}
