import { Router } from "express";
import type { AppDeps } from "../../app";

export function statsRoutes(_deps: AppDeps) {
  const router = Router();
  return router;
}
