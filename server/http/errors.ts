/** A refusal with a stable code, mapped to HTTP in one place (errorHandler). */
export class AppError extends Error {
  constructor(
    readonly code: string,
    readonly status: number,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = "AppError";
  }
}

type ErrorDef = { code: string; status: number; message: string };

/** Declares an error once; call it to make an instance with optional message/details. */
export function defineError(def: ErrorDef) {
  const make = (message?: string, details?: unknown) => new AppError(def.code, def.status, message ?? def.message, details);
  return Object.assign(make, def);
}

export const Errors = {
  invalidInput: defineError({ code: "invalid_input", status: 400, message: "Some fields are missing or not valid." }),
  notSignedIn: defineError({ code: "not_signed_in", status: 401, message: "Sign in to continue." }),
  badCredentials: defineError({ code: "bad_credentials", status: 401, message: "E-mail or password is not right." }),
  forbidden: defineError({ code: "role_not_allowed", status: 403, message: "Your role may not do this." }),
  csrf: defineError({ code: "csrf_token_invalid", status: 403, message: "The form is out of date; reload the page and try again." }),
  notFound: defineError({ code: "not_found", status: 404, message: "Not found." }),
  conflict: defineError({ code: "conflict", status: 409, message: "Refused by a rule." }),
  tooMany: defineError({ code: "too_many_attempts", status: 429, message: "Too many attempts; wait a few minutes and try again." }),
};

/** A 404 naming what was not found, e.g. notFound("tool", "MIC-0001"). */
export function notFound(what: string, key?: string | number) {
  return new AppError(`${what.replace(/\s+/g, "_")}_not_found`, 404, key === undefined ? `No such ${what}.` : `No ${what} "${key}".`);
}

/** A 409 refusal by a rule of the trade, with the rule's code. */
export function refused(code: string, message: string, details?: unknown) {
  return new AppError(code, 409, message, details);
}
