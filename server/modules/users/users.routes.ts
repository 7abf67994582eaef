import { Router } from "express";
import { z } from "zod";
import { defineRoutes } from "../../http/route";
import type { AppDeps } from "../../app-deps";
import { usersService } from "./users.service";
import { usersRepository } from "./users.repository";
import { toUserDetail } from "./users.service";
import { CreateUserSchema, ResetPasswordSchema, RoleSchema, UpdateUserSchema, UserDetailSchema } from "../../../shared/users/users.schemas";
import { PageQuerySchema, pageOf } from "../../../shared/common/lists.schemas";

const UserListQuery = PageQuerySchema.extend({
  q: z.string().trim().max(100).optional(),
  role: RoleSchema.optional(),
  active: z.enum(["true", "false"]).transform((v) => v === "true").optional(),
});

const PersonSchema = z.object({ id: z.string(), name: z.string(), email: z.string(), role: RoleSchema, badgeCode: z.string().nullable() });

export function usersRoutes(deps: AppDeps) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "users");
  const service = usersService(deps);

  route({ method: "get", path: "/api/users", summary: "List users", access: "users.manage", query: UserListQuery, response: pageOf(UserDetailSchema) }, async ({ query }) => {
    const { items, total } = await usersRepository.list(deps.db, query);
    return { items: items.map(toUserDetail), total };
  });

  route({ method: "post", path: "/api/users", summary: "Create a user", access: "users.manage", body: CreateUserSchema, response: UserDetailSchema }, ({ body, user }) =>
    service.create(body, user.id),
  );

  route({ method: "patch", path: "/api/users/:id", summary: "Change a user's name, role, badge or certificate, or deactivate them", access: "users.manage", body: UpdateUserSchema, response: UserDetailSchema, status: 200 }, ({ body, params, user }) =>
    service.update(z.string().uuid().parse(params.id), body, user.id),
  );

  route({ method: "post", path: "/api/users/:id/password", summary: "Reset a user's password (ends their sessions)", access: "users.manage", body: ResetPasswordSchema, status: 204 }, ({ body, params, user }) =>
    service.resetPassword(z.string().uuid().parse(params.id), body.password, user.id),
  );

  // People pickers (issue a tool to…, notify…) need names, not admin rights.
  route({ method: "get", path: "/api/people", summary: "Find active people by name, e-mail or badge code", access: "signedIn", query: UserListQuery.omit({ active: true }), response: pageOf(PersonSchema) }, async ({ query }) => {
    const { items, total } = await usersRepository.list(deps.db, { ...query, active: true });
    return { items: items.map((u) => ({ id: u.id, name: u.name, email: u.email, role: u.role, badgeCode: u.badgeCode })), total };
  });

  return router;
}
