import { Router } from "express";
import type { AppDeps } from "../../app";

export function transfersRoutes(_deps: AppDeps) {
  const router = Router();
  return router;
}
