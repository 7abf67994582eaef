import { Router } from "express";
import type { AppDeps } from "../../app";

export function remindersRoutes(_deps: AppDeps) {
  const router = Router();
  return router;
}
