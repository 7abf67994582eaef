import bcrypt from "bcryptjs";
import type { Db } from "../db/client";
import { users } from "../modules/users/users.table";
import { BCRYPT_COST } from "../modules/users/users.service";
import type { UserRow } from "../modules/users/users.repository";

// Invented people of an invented shop (Harrow Flats Engine Works, demo data).
export const DEMO_PEOPLE = [
  { key: "admin", email: "admin@tenthwise.test", name: "Ines Halvorsen", role: "admin" },
  { key: "quality", email: "quality@tenthwise.test", name: "Teodor Quill", role: "quality" },
  { key: "inspector", email: "inspector@tenthwise.test", name: "Marisol Oyelaran", role: "inspector", certificateNumber: "IA-DEMO-40817" },
  { key: "crib", email: "crib@tenthwise.test", name: "Casimir Brandt", role: "crib" },
  { key: "mechanic", email: "mechanic@tenthwise.test", name: "Dagny Forsell", role: "mechanic", badgeCode: "B-1042" },
  { key: "auditor", email: "auditor@tenthwise.test", name: "Rupert Anwick", role: "auditor" },
  { key: "mechanic2", email: "okonkwo@tenthwise.test", name: "Ezra Okonkwo-Lind", role: "mechanic", badgeCode: "B-1077" },
  { key: "mechanic3", email: "vashti@tenthwise.test", name: "Vashti Penrose", role: "mechanic", badgeCode: "B-1093" },
  { key: "inspector2", email: "halloran@tenthwise.test", name: "Bede Halloran", role: "inspector", certificateNumber: "IA-DEMO-51230" },
] as const;

export async function seedUsers(db: Db, password: string) {
  const hash = await bcrypt.hash(password, BCRYPT_COST);
  const people: Record<string, UserRow> = {};
  for (const p of DEMO_PEOPLE) {
    const [row] = await db
      .insert(users)
      .values({
        email: p.email,
        name: p.name,
        role: p.role,
        passwordHash: hash,
        badgeCode: "badgeCode" in p ? p.badgeCode : null,
        certificateNumber: "certificateNumber" in p ? p.certificateNumber : null,
      })
      .returning();
    people[p.key] = row;
  }
  return people;
}
