import type { AppDeps } from "../server/app";

/** Starts the scheduled jobs of a running server; returns a function that stops them. */
export async function startSchedules(_deps: AppDeps): Promise<() => void> {
  return () => {};
}
