import { eq } from "drizzle-orm";
import type { SeedContext } from "./seed-context";
import { settings } from "../modules/settings/settings.table";
import { seedUsers } from "./users.seed";
import { seedRegister } from "./register.seed";
import { seedCrib } from "./crib.seed";
import { seedInspection } from "./inspection.seed";
import { seedInvestigations } from "./investigations.seed";
import { seedReminders } from "./reminders.seed";
import { seedStudies } from "./studies.seed";
import { updateSettings } from "../modules/settings/settings.service";

/** The invented demo shop's name, as Settings, e-mails and labels show it (README "Demo sign-ins"). */
export const DEMO_SHOP_NAME = "Harrow Flats Engine Works, demo shop";

/** The settings key the demo seed writes when it has run; demo:reset drops only a database carrying it. */
export const DEMO_MARK = "demo_seeded_at";

/**
 * Seeds the invented demo shop once. A marker row in settings records that it
 * ran, so later starts never wipe or duplicate anything; a database that
 * already has people in it is never seeded.
 */
export async function seedDemoOnce(ctx: Omit<SeedContext, "users" | "people" | "shared">, password: string): Promise<boolean> {
  const { db } = ctx;
  const marked = await db.query.settings.findFirst({ where: eq(settings.key, DEMO_MARK) });
  if (marked) return false;
  const anyone = await db.query.users.findFirst();
  if (anyone) return false;

  const people = await seedUsers(db, password);
  const full: SeedContext = {
    ...ctx,
    people,
    users: { admin: people.admin, quality: people.quality, inspector: people.inspector, crib: people.crib, mechanic: people.mechanic, auditor: people.auditor },
    shared: {},
  };
  // The shop's name first: e-mails, labels and pages the later parts produce carry it.
  await db.transaction((tx) => updateSettings(tx, ctx.config.SHOP_TIME_ZONE, { shopName: DEMO_SHOP_NAME }, people.admin.id));
  await seedRegister(full);
  await seedCrib(full);
  await seedInspection(full);
  await seedInvestigations(full);
  await seedStudies(full);
  await seedReminders(full);
  await db.insert(settings).values({ key: DEMO_MARK, value: { at: ctx.clock.now().toISOString() } });
  return true;
}
