import { driverError } from "../http/error-handler";

/** True when the error is PostgreSQL refusing a duplicate under the named unique index or constraint. */
export function isUniqueViolation(e: unknown, constraint: string) {
  const p = driverError(e);
  return p?.code === "23505" && p.constraint === constraint;
}
