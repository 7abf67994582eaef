import { Router } from "express";
import type { AppDeps } from "../../app";

export function intervalsRoutes(_deps: AppDeps) {
  const router = Router();
  return router;
}
