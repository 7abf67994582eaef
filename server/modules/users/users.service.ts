import bcrypt from "bcryptjs";
import type { Db } from "../../db/client";
import type { Clock } from "../../platform/clock";
import { usersRepository, type UserRow } from "./users.repository";
import { forgetSignedInUser } from "./signed-in-cache";
import { forgetSessionsOf } from "../../auth/session-store";
import { recordAudit } from "../audit/audit.repository";
import { AppError, notFound } from "../../http/errors";
import { assertStrongPassword } from "../../auth/password-policy";
import type { CreateUserInput, UpdateUserInput, UserDetail } from "../../../shared/users/users.schemas";

// Cost 10 (OWASP minimum for bcrypt): about 60 ms per sign-in here.
export const BCRYPT_COST = 10;

// An unknown e-mail is compared against a hash of the same cost as real ones, so a failed sign-in takes
// as long whether or not the person exists (no account enumeration by timing).
let dummyHash: Promise<string> | null = null;
const hashForUnknown = () => (dummyHash ??= bcrypt.hash("tenthwise-no-such-person", BCRYPT_COST));

/** The user as other people may see them. */
export function toUserDetail(u: UserRow): UserDetail {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    badgeCode: u.badgeCode,
    certificateNumber: u.certificateNumber,
    createdAt: u.createdAt.toISOString(),
  };
}

export function usersService({ db, clock }: { db: Db; clock: Clock }) {
  return {
    async verifyPassword(email: string, password: string): Promise<UserRow | null> {
      const user = await usersRepository.findByEmail(db, email.trim().toLowerCase());
      const ok = await bcrypt.compare(password, user?.passwordHash ?? (await hashForUnknown()));
      if (!user || !ok || !user.active) return null;
      return user;
    },

    async create(input: CreateUserInput, actorId: string | null) {
      await assertStrongPassword(input.password, input);
      return db.transaction(async (tx) => {
        if (await usersRepository.findByEmail(tx, input.email)) {
          throw new AppError("email_taken", 409, `Someone already signs in as ${input.email}.`);
        }
        const row = await usersRepository.insert(tx, {
          email: input.email,
          name: input.name,
          role: input.role,
          passwordHash: await bcrypt.hash(input.password, BCRYPT_COST),
          badgeCode: input.badgeCode ?? null,
          certificateNumber: input.certificateNumber ?? null,
        });
        await recordAudit(tx, { actorId, action: "user.create", entityType: "user", entityId: row.id, after: toUserDetail(row) });
        return toUserDetail(row);
      });
    },

    async update(id: string, patch: UpdateUserInput, actorId: string) {
      return db.transaction(async (tx) => {
        const before = await usersRepository.findById(tx, id);
        if (!before) throw notFound("user", id);
        if (id === actorId && (patch.active === false || (patch.role && patch.role !== "admin"))) {
          throw new AppError("cannot_demote_self", 409, "You cannot deactivate yourself or remove your own admin role; ask another admin.");
        }
        const row = await usersRepository.update(tx, id, {
          ...patch,
          ...(patch.active === false && before.active ? { deactivatedAt: clock.now() } : {}),
          ...(patch.active === true ? { deactivatedAt: null } : {}),
        });
        if (patch.active === false) await usersRepository.deleteSessions(tx, id);
        await recordAudit(tx, { actorId, action: "user.update", entityType: "user", entityId: id, before: toUserDetail(before), after: toUserDetail(row) });
        return toUserDetail(row);
      }).finally(() => {
        forgetSignedInUser(id);
        if (patch.active === false) forgetSessionsOf(id);
      });
    },

    async resetPassword(id: string, password: string, actorId: string) {
      return db.transaction(async (tx) => {
        const before = await usersRepository.findById(tx, id);
        if (!before) throw notFound("user", id);
        await assertStrongPassword(password, before);
        await usersRepository.update(tx, id, { passwordHash: await bcrypt.hash(password, BCRYPT_COST) });
        await usersRepository.deleteSessions(tx, id);
        await recordAudit(tx, { actorId, action: "user.reset_password", entityType: "user", entityId: id });
      }).finally(() => forgetSessionsOf(id));
    },
  };
}
