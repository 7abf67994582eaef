import seedrandom from "seedrandom";
import { eq } from "drizzle-orm";
import type { SeedContext } from "./seed-context";
import { fixedClock } from "../platform/clock";
import { families } from "../db/schema";
import { studiesService } from "../modules/studies/studies.service";
import { CreateStudySchema } from "../../shared/studies/studies.schemas";
import type { SessionUser } from "../http/route";
import type { UserRow } from "../modules/users/users.repository";

// Two invented gauge studies on the demo engine's table of limits (demo data): a finished one of the 0–1 in
// micrometers on the piston pin, whose 0.0005 in tolerance is too tight for a 0.0001 in micrometer (not
// acceptable, so later pin readings with that family carry the flag), and one in progress on the valve stems that
// the demo mechanic can carry on with. Every value is made up by the formula below, nothing is measured.

const DAY = 86_400_000;
const sessionUser = (u: UserRow): SessionUser => ({ id: u.id, email: u.email, name: u.name, role: u.role });

/**
 * Invented readings: a true size per part, a small bias per appraiser, scatter, read to the tool's 0.0001 in. Each
 * value depends only on its part, appraiser and trial, so the demo's results are the same whatever order is drawn.
 */
function inventedReader(seed: string, sizes: number[], bias: number[], scatter: number) {
  return (part: number, appraiser: number, trial: number) => {
    const rng = seedrandom(`${seed}/${part}/${appraiser}/${trial}`);
    // A sum of uniforms looks enough like bench scatter for a demonstration.
    const noise = (rng() + rng() + rng() - 1.5) * scatter;
    return Number((sizes[part - 1] + bias[appraiser] + noise).toFixed(4));
  };
}

async function takeAll(ctx: SeedContext, studyId: string, people: UserRow[], tools: string[], read: (part: number, appraiser: number, trial: number) => number, start: Date, stopAfter: number[] = []) {
  const clock = fixedClock(start);
  const service = studiesService({ db: ctx.db, clock, config: ctx.config });
  for (const [j, person] of people.entries()) {
    const user = sessionUser(person);
    let done = 0;
    for (;;) {
      const s = await service.session(studyId, user);
      if (!s.prompt || (stopAfter[j] != null && done >= stopAfter[j])) break;
      clock.set(new Date(clock.now().getTime() + 70_000));
      await service.record(studyId, { part: s.prompt.part, trial: s.prompt.trial, value: read(s.prompt.part, j, s.prompt.trial), toolAssetTags: [tools[j]] }, user);
      done++;
    }
    clock.set(new Date(clock.now().getTime() + 40 * 60_000));
  }
}

export async function seedStudies(ctx: SeedContext): Promise<void> {
  const { db } = ctx;
  const tableId = (ctx.shared.inspection as { limitTableId: string } | undefined)?.limitTableId;
  if (!tableId) throw new Error("Studies seed needs the inspection seed's table of limits");
  const [mic] = await db.select().from(families).where(eq(families.name, "Outside micrometer 0-1 in"));
  if (!mic) throw new Error("Studies seed needs the register's 0-1 in micrometer family");
  const quality = sessionUser(ctx.users.quality);
  const appraisers = [ctx.users.mechanic, ctx.people.mechanic2, ctx.people.mechanic3];
  const now = ctx.clock.now();

  // Finished: ten worn piston pins, three mechanics, three trials, twelve days ago.
  const setUp = new Date(now.getTime() - 12 * DAY);
  setUp.setUTCHours(14, 0, 0, 0);
  const finished = await studiesService({ db, clock: fixedClock(setUp), config: ctx.config }).create(
    CreateStudySchema.parse({
      limitTableId: tableId,
      itemKey: "pin_dia",
      familyId: mic.id,
      parts: ["PIN-A", "PIN-B", "PIN-C", "PIN-D", "PIN-E", "PIN-F", "PIN-G", "PIN-H", "PIN-J", "PIN-K"].map((label) => ({ label })),
      appraiserIds: appraisers.map((a) => a.id),
      trials: 3,
      purpose: "Before trusting the bench micrometers on piston pins: ten pins from the scrap bin spanning new to worn (demo data, invented values).",
      isDemo: true,
    }),
    quality,
  );
  const pins = inventedReader("harrow-flats-pin-study", [0.8742, 0.8749, 0.8745, 0.8751, 0.8743, 0.8747, 0.8744, 0.875, 0.8746, 0.8748], [0, 0.00004, -0.00003], 0.00008);
  await takeAll(ctx, finished.id, appraisers, ["MIC-0101", "MIC-0106", "MIC-0109"], pins, new Date(setUp.getTime() + 2 * 3600_000));

  // In progress: eight valve stems, two trials; Ezra has finished, Dagny is half-way, Vashti has not started.
  const setUp2 = new Date(now.getTime() - 2 * DAY);
  setUp2.setUTCHours(13, 0, 0, 0);
  const open = await studiesService({ db, clock: fixedClock(setUp2), config: ctx.config }).create(
    CreateStudySchema.parse({
      limitTableId: tableId,
      itemKey: "stem_dia",
      familyId: mic.id,
      parts: ["STEM-1", "STEM-2", "STEM-3", "STEM-4", "STEM-5", "STEM-6", "STEM-7", "STEM-8"].map((label) => ({ label })),
      appraiserIds: [ctx.people.mechanic2.id, ctx.users.mechanic.id, ctx.people.mechanic3.id],
      trials: 2,
      purpose: "Valve stems with the same micrometers (demo data, invented values).",
      isDemo: true,
    }),
    quality,
  );
  const stems = inventedReader("harrow-flats-stem-study", [0.4331, 0.4338, 0.4334, 0.4339, 0.4336, 0.4332, 0.4337, 0.4335], [0.00002, 0, -0.00002], 0.00008);
  await takeAll(ctx, open.id, [ctx.people.mechanic2, ctx.users.mechanic, ctx.people.mechanic3], ["MIC-0106", "MIC-0101", "MIC-0109"], stems, new Date(setUp2.getTime() + 3600_000), [16, 7, 0]);

  ctx.shared.studies = { finishedId: finished.id, openId: open.id };
}
