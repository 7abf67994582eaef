import type { Request, Response, Router } from "express";
import type { z } from "zod";
import { can, PERMISSIONS, type Permission, type Role } from "../../shared/auth/roles";
import { AppError, Errors } from "./errors";
import type { OpenApiRegistry } from "../openapi/registry";

/** The signed-in person, as the session holds them. */
export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}

type Access = Permission | "signedIn" | "public";

export interface RouteSpec<B extends z.ZodType | undefined, Q extends z.ZodType | undefined> {
  method: "get" | "post" | "put" | "patch" | "delete";
  path: string;
  summary: string;
  access: Access;
  body?: B;
  query?: Q;
  response?: z.ZodType;
  /** Success status; 204 sends no body. */
  status?: number;
  /** For routes that answer with a file (PDF, CSV) rather than JSON. */
  produces?: string;
}

export interface RouteContext<B, Q> {
  body: B;
  query: Q;
  params: Record<string, string>;
  user: SessionUser;
  req: Request;
  res: Response;
}

type Infer<T> = T extends z.ZodType ? z.infer<T> : undefined;

/** A route's own part of answering a request (routeRunner): what runs once the middleware has run. */
export type RouteRunner = (req: Request, res: Response) => Promise<void>;

/**
 * Declares one HTTP route: role guard, zod validation of body and query, the
 * handler's answer as JSON, and its entry in the OpenAPI document.
 */
export function defineRoutes(router: Router, registry: OpenApiRegistry, tag: string) {
  return function route<B extends z.ZodType | undefined = undefined, Q extends z.ZodType | undefined = undefined>(
    spec: RouteSpec<B, Q>,
    handler: (ctx: RouteContext<Infer<B>, Infer<Q>>) => Promise<unknown> | unknown,
  ): RouteRunner {
    registry.add({
      method: spec.method,
      path: spec.path,
      summary: spec.summary,
      tag,
      permission: spec.access === "public" ? "anyone" : spec.access === "signedIn" ? "any signed-in role" : `roles ${describeAccess(spec.access)}`,
      body: spec.body,
      query: spec.query,
      response: spec.response,
      status: spec.status ?? (spec.method === "post" ? 201 : 200),
      produces: spec.produces,
    });
    const run = routeRunner(spec, handler);
    router[spec.method](spec.path, run);
    return run;
  };
}

/**
 * The route's own part, without the router: role guard, refusal of unreadable input, zod validation of body and
 * query, the handler, the answer. The same function answers whether the request came through the router or was
 * taken at the front (server/http/quick-get.ts).
 */
export function routeRunner<B extends z.ZodType | undefined = undefined, Q extends z.ZodType | undefined = undefined>(
  spec: RouteSpec<B, Q>,
  handler: (ctx: RouteContext<Infer<B>, Infer<Q>>) => Promise<unknown> | unknown,
): RouteRunner {
  return async (req: Request, res: Response) => {
    const user = req.user as SessionUser | undefined;
    if (spec.access !== "public") {
      if (!user) throw Errors.notSignedIn();
      if (spec.access !== "signedIn" && !can(user.role, spec.access)) throw Errors.forbidden(`Your role (${user.role}) may not do this.`);
    }
    refuseUnreadableInput(req, spec.method !== "get" && spec.method !== "delete");
    const body = spec.body ? spec.body.parse(req.body ?? {}) : undefined;
    const query = spec.query ? spec.query.parse(req.query ?? {}) : undefined;
    const out = await handler({ body, query, params: req.params as Record<string, string>, user: user as SessionUser, req, res } as RouteContext<Infer<B>, Infer<Q>>);
    if (res.headersSent) return;
    const status = spec.status ?? (spec.method === "post" ? 201 : 200);
    if (status === 204) res.status(204).end();
    else res.status(status).json(out);
  };
}

/**
 * Input no schema should ever have to think about: a body sent in a form the server did not read (not
 * JSON, not an upload it parsed) is 415 rather than silently read as `{}`; a NUL character anywhere in
 * the body, query or path is 400 (PostgreSQL text cannot hold it, and no person types one).
 */
function refuseUnreadableInput(req: Request, writes: boolean) {
  if (writes && req.body === undefined && hasBody(req)) {
    throw new AppError("unsupported_media_type", 415, "Send the request body as JSON (Content-Type: application/json).");
  }
  const where = findNul(req.params, ["params"]) ?? findNul(req.query, ["query"]) ?? findNul(req.body, ["body"]);
  if (where) {
    throw Errors.invalidInput(`A NUL character is not allowed in text (${where.join(".")}).`, [{ code: "invalid_string", path: where.slice(1), message: "NUL characters are not allowed." }]);
  }
}

/** True when the request carries a body (RFC 9112 §6.3: Transfer-Encoding or a non-zero Content-Length). */
function hasBody(req: Request) {
  return req.headers["transfer-encoding"] !== undefined || Number(req.headers["content-length"] ?? 0) > 0;
}

function findNul(v: unknown, path: (string | number)[], depth = 0): (string | number)[] | null {
  if (depth > 32 || v == null) return null;
  if (typeof v === "string") return v.includes("\u0000") ? path : null;
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      const hit = findNul(v[i], [...path, i], depth + 1);
      if (hit) return hit;
    }
    return null;
  }
  if (typeof v === "object") {
    for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
      if (k.includes("\u0000")) return [...path, k];
      const hit = findNul(x, [...path, k], depth + 1);
      if (hit) return hit;
    }
  }
  return null;
}

function describeAccess(p: Permission): string {
  return (PERMISSIONS[p] as readonly string[]).join(", ");
}
