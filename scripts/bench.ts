// Benchmark, not a test: how the status derivation scales from a 2,000-tool
// register to a 20,000-tool one. Prints the times and their RATIO (10× the
// tools should cost about 10× for the whole register, and about 1× for a page).
//   npm run bench            (uses the quick test cluster: bash scripts/test-quick.sh starts it)
//   BENCH_PG_URL=postgres://app@127.0.0.1:55439 npx tsx scripts/bench.ts
import pg from "pg";
import { sql } from "drizzle-orm";
import { createDb } from "../server/db/client";
import { runMigrations } from "../server/db/migrate";
import { statusContext, statusesFor } from "../server/modules/tools/tool-status.service";
import { statsService } from "../server/modules/stats/stats.service";
import { fixedClock } from "../server/platform/clock";

const BASE = process.env.BENCH_PG_URL ?? process.env.TEST_PG_URL ?? "postgres://app@127.0.0.1:55439";
const ZONE = "America/Chicago";
const NOW = new Date("2026-06-15T15:00:00Z");

async function admin(q: string) {
  const c = new pg.Client({ connectionString: `${BASE}/postgres` });
  await c.connect();
  await c.query(q);
  await c.end();
}

/** A register of n tools: one family per 200 tools, two calibrations each (due dates spread over the year), a check-out on every tenth, a hold on every fiftieth. */
async function fill(db: ReturnType<typeof createDb>["db"], n: number) {
  await db.execute(sql`insert into families (name, kind, unit, default_interval_days, mpe) select 'Bench family ' || g, 'outside_micrometer', 'in', 365, 0.0001 from generate_series(1, ${Math.ceil(n / 200)}) g`);
  await db.execute(sql`
    insert into tools (asset_tag, family_id, description, serial_number, unit, range_min, range_max, resolution, interval_days)
    select 'B-' || lpad(g::text, 6, '0'), (select id from families order by name offset (g % ${Math.ceil(n / 200)}) limit 1), 'Bench micrometer', 'SN' || g, 'in', 0, 1, 0.0001, 365
    from generate_series(1, ${n}) g`);
  await db.execute(sql`
    insert into calibrations (tool_id, performed_at, decision_rule, result, as_found_in_tolerance, interval_days, next_due_at)
    select t.id, ${NOW.toISOString()}::timestamptz - ((400 + k * 365 + (row_number() over ()) % 365) || ' days')::interval, 'simple', 'pass', true, 365,
      (${NOW.toISOString()}::timestamptz - ((400 + k * 365 + (row_number() over ()) % 365) || ' days')::interval)::date + 365
    from tools t cross join generate_series(0, 1) k`);
  const users = await db.execute(sql`insert into users (email, name, role, password_hash) values ('bench@example.test', 'Bench', 'mechanic', 'x') returning id`);
  const uid = (users.rows[0] as { id: string }).id;
  await db.execute(sql`insert into checkouts (tool_id, user_id, issued_at, due_back_at) select id, ${uid}::uuid, ${NOW.toISOString()}::timestamptz - interval '2 hours', ${NOW.toISOString()}::timestamptz + interval '6 hours' from tools where (substr(asset_tag, 3)::int) % 10 = 0`);
  await db.execute(sql`insert into holds (tool_id, placed_at, reason) select id, ${NOW.toISOString()}::timestamptz - interval '1 day', 'bench' from tools where (substr(asset_tag, 3)::int) % 50 = 0`);
  await db.execute(sql`analyze`);
}

async function median(runs: number, f: () => Promise<unknown>) {
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await f();
    times.push(performance.now() - t0);
  }
  return times.sort((a, b) => a - b)[Math.floor(runs / 2)];
}

async function measure(n: number) {
  const name = `bench_${process.pid}_${n}`;
  await admin(`create database "${name}"`);
  const url = `${BASE}/${name}`;
  await runMigrations(url);
  const { db, pool } = createDb(url, 10);
  try {
    await fill(db, n);
    const ctx = await statusContext(db, ZONE);
    const ids = ((await db.execute(sql`select id from tools order by asset_tag`)).rows as { id: string }[]).map((r) => r.id);
    const stats = statsService({ db, clock: fixedClock(NOW), timeZone: ZONE });
    await stats.overview(); // warm up
    const whole = await median(3, () => stats.overview());
    const page = await median(5, () => statusesFor(db, ids.slice(ids.length / 2, ids.length / 2 + 50), NOW, ctx));
    return { n, whole, page };
  } finally {
    await pool.end();
    await admin(`drop database if exists "${name}" with (force)`);
  }
}

const small = await measure(2_000);
const large = await measure(20_000);
const ms = (x: number) => `${x.toFixed(0)} ms`;
console.log(`statuses of the whole register (GET /api/stats/overview): ${small.n} tools ${ms(small.whole)}, ${large.n} tools ${ms(large.whole)}`);
console.log(`statuses of one page of 50 (a list page):               ${small.n} tools ${ms(small.page)}, ${large.n} tools ${ms(large.page)}`);
console.log(`RATIO whole register 20,000 / 2,000: ${(large.whole / small.whole).toFixed(2)} (linear would be 10)`);
console.log(`RATIO one page       20,000 / 2,000: ${(large.page / small.page).toFixed(2)} (flat would be 1)`);
