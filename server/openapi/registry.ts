import { z } from "zod";

export interface RouteDoc {
  method: "get" | "post" | "put" | "patch" | "delete";
  path: string;
  summary: string;
  tag: string;
  permission: string;
  body?: z.ZodType;
  query?: z.ZodType;
  response?: z.ZodType;
  status: number;
  produces?: string;
}

/** Every route registers itself here; GET /api/openapi.json is generated from the same zod schemas that validate. */
export class OpenApiRegistry {
  private readonly routes: RouteDoc[] = [];

  add(doc: RouteDoc) {
    this.routes.push(doc);
  }

  list(): readonly RouteDoc[] {
    return this.routes;
  }

  document(info: { title: string; version: string }) {
    const paths: Record<string, Record<string, unknown>> = {};
    const toSchema = (s: z.ZodType, io: "input" | "output") =>
      z.toJSONSchema(s, { target: "draft-2020-12", unrepresentable: "any", io }) as Record<string, unknown>;
    for (const r of this.routes) {
      const p = r.path.replace(/:([A-Za-z0-9_]+)/g, "{$1}");
      const params = [...r.path.matchAll(/:([A-Za-z0-9_]+)/g)].map((m) => ({ name: m[1], in: "path", required: true, schema: { type: "string" } }));
      const query: unknown[] = [];
      if (r.query) {
        const js = toSchema(r.query, "input") as { properties?: Record<string, unknown>; required?: string[] };
        for (const [name, schema] of Object.entries(js.properties ?? {})) {
          query.push({ name, in: "query", required: js.required?.includes(name) ?? false, schema });
        }
      }
      const op: Record<string, unknown> = {
        summary: r.summary,
        tags: [r.tag],
        description: `Allowed: ${r.permission}.`,
        parameters: [...params, ...query],
        responses: {
          [String(r.status)]: r.response
            ? { description: "OK", content: { "application/json": { schema: toSchema(r.response, "output") } } }
            : { description: r.produces ? `A ${r.produces} document` : "OK", ...(r.produces ? { content: { [r.produces]: {} } } : {}) },
          "400": { $ref: "#/components/responses/Error" },
          "401": { $ref: "#/components/responses/Error" },
          "403": { $ref: "#/components/responses/Error" },
        },
      };
      if (r.body) op.requestBody = { required: true, content: { "application/json": { schema: toSchema(r.body, "input") } } };
      paths[p] = { ...(paths[p] ?? {}), [r.method]: op };
    }
    return {
      openapi: "3.1.0",
      info,
      servers: [{ url: "/" }],
      components: {
        securitySchemes: { session: { type: "apiKey", in: "cookie", name: "tenthwise.sid" }, csrf: { type: "apiKey", in: "header", name: "X-CSRF-Token" } },
        responses: {
          Error: {
            description: "Refusal with a stable code",
            content: {
              "application/json": {
                schema: {
                  type: "object",
                  properties: { error: { type: "object", properties: { code: { type: "string" }, message: { type: "string" }, details: {} }, required: ["code", "message"] } },
                },
              },
            },
          },
        },
      },
      security: [{ session: [] }],
      paths,
    };
  }
}
