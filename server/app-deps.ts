import type pg from "pg";
import type { Logger } from "pino";
import type { Db } from "./db/client";
import type { Config } from "./config";
import type { Clock } from "./platform/clock";
import type { Mailer } from "./platform/mailer";
import type { ObjectStorage } from "./platform/storage";
import type { OpenApiRegistry } from "./openapi/registry";

// Kept apart from app.ts so route files and jobs depend on these types only,
// never on the app factory that imports them (no import circle).

/** What the app is built from; tests pass their own database, clock, mailer and storage. */
export interface AppServices {
  db: Db;
  pool: pg.Pool;
  config: Config;
  clock: Clock;
  mailer: Mailer;
  storage: ObjectStorage;
  logger?: Logger;
  /** Folder of the built client; served when it exists. */
  clientDir?: string;
}

/** What every route module and job receives. */
export type AppDeps = AppServices & { registry: OpenApiRegistry; logger: Logger };
