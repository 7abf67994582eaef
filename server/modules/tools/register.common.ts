import type { Logger } from "pino";
// Small pieces shared by the register modules (families, tools, standards, labs, calibrations, checks).
import { z } from "zod";
import type { Db } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { Mailer } from "../../platform/mailer";
import type { ObjectStorage } from "../../platform/storage";
import { dec, type DecimalLike } from "../../../shared/common/decimal";
import { AppError } from "../../http/errors";

/** What the register services need; the app passes its deps, the seed passes a clock set in the past. */
export interface RegisterDeps {
  db: Db;
  clock: Clock;
  mailer?: Mailer;
  storage?: ObjectStorage | null;
  /** Told of what fails after a reply was sent (an investigation's readings not gathered). */
  logger?: Logger;
  /** Configured shop time zone; the settings may override it. */
  defaultTimeZone: string;
}

/** A length for a numeric column: exact, in plain notation (never "1e-7"). */
export const toDb = (x: DecimalLike) => dec(x).toFixed();
export const toDbOrNull = (x: DecimalLike | null | undefined) => (x == null ? null : toDb(x));

/** A numeric column's exact decimal string as a JSON number, for the API edge. */
export const fromDb = (s: string) => Number(s);
export const fromDbOrNull = (s: string | null | undefined) => (s == null ? null : Number(s));

export const isoOrNull = (d: Date | null | undefined) => (d == null ? null : d.toISOString());

/** A uuid path parameter; anything else is a 400 before any query runs. */
export const uuidParam = (v: string | undefined) => z.string().uuid("Not a record id.").parse(v);

/** 400 for a body that names a record that does not exist (bad input, not a missing page). */
export function unknownReference(what: string, id: string) {
  return new AppError(`unknown_${what}`, 400, `There is no ${what.replace(/_/g, " ")} with id ${id}.`);
}
