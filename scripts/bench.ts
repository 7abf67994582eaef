// Benchmark, not a test (docs/performance.md). Run through `npm run bench`, which starts a throwaway
// PostgreSQL cluster and builds the app first:
//   npm run bench                         20,000 tools (and 2,000 for growth), 3 rounds
//   npm run bench -- --tools 2000         a smaller register to try it (growth from 200)
//   npm run bench -- --no-growth --rounds 1 --duration 3
//   npm run bench -- --warmup 0            no unmeasured load before each run (default 2 s)
// Fills a database per scale with set-based SQL (triggers fire as for any insert), starts the built app
// and a floor server (bare Express 5 + node-postgres, one indexed lookup of a tool by asset tag) on it,
// drives both over HTTP with autocannon, interleaved, and prints one line per measure:
//   RATIO <measure> app_p95=<ms> floor_p95=<ms> ratio=<x> goal=<x>
import { fork, spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { fileURLToPath } from "node:url";
import autocannon from "autocannon";
import bcrypt from "bcryptjs";
import pg from "pg";
import { pino } from "pino";
import { prepareDatabase } from "../server/db/roles";
import { createDb } from "../server/db/client";
import { loadConfig } from "../server/config";
import { systemClock } from "../server/platform/clock";
import { sendDueReminders } from "../jobs/send-due-reminders.job";
import { onOutOfToleranceFinding } from "../server/modules/investigations/investigations.hooks";
import { JUDGING_RULES_VERSION, judgeReading } from "../shared/inspection/judging";

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const BASE = process.env.BENCH_PG_URL ?? "postgres://app@127.0.0.1:55439";
const PASSWORD = "bench-password-0123456789";

// ---- What is measured: one row per measure (paths here, nowhere else) ---------------------------------------
type Place = { sheetId: string; itemKey: string; index: number };
/** `nextPlace` moves to a fresh place (called once per request, by its path); `place` is that place (read by its body). */
type Ctx = { tag: () => string; sheetId: string; investigationId: string | null; writeTag: () => string; nextPlace: () => Place; place: () => Place };
interface Measure {
  name: string;
  role: "mechanic" | "quality" | "inspector" | "admin";
  connections: number;
  goal: number;
  method?: "GET" | "POST";
  path: (c: Ctx) => string | null; // null: cannot be measured on this database (printed as SKIP)
  body?: (c: Ctx) => object;
}
const MEASURES: Measure[] = [
  { name: "status_lookup", role: "mechanic", connections: 16, goal: 3, path: (c) => `/api/tools/${c.tag()}/status` },
  { name: "register_list", role: "quality", connections: 1, goal: 15, path: () => `/api/tools?status=overdue&sort=dueAt&pageSize=50` },
  { name: "overview", role: "quality", connections: 1, goal: 60, path: () => `/api/stats/overview` },
  { name: "home_dashboard", role: "quality", connections: 1, goal: 60, path: () => `/api/stats/dashboard` },
  { name: "home_mine", role: "mechanic", connections: 1, goal: 60, path: () => `/api/stats/mine` },
  { name: "home_inspection", role: "inspector", connections: 1, goal: 60, path: () => `/api/stats/inspection` },
  { name: "check_sheet", role: "inspector", connections: 1, goal: 60, path: (c) => `/api/jobs/${c.sheetId}` },
  { name: "investigation_page", role: "quality", connections: 1, goal: 30, path: (c) => (c.investigationId ? `/api/investigations/${c.investigationId}/items?page=1&pageSize=50` : null) },
  {
    name: "record_reading",
    role: "mechanic",
    connections: 8,
    goal: 8,
   
    method: "POST",
    path: (c) => `/api/jobs/${c.nextPlace().sheetId}/readings`,
    body: (c) => ({ itemKey: c.place().itemKey, index: c.place().index, values: [2.5001, 2.5002], toolAssetTags: [c.writeTag()] }),
  },
];
const INVESTIGATION_OPEN_GOAL = 180;
/** Growth from the small to the large register, for every measure above: each is one tool's answer or one page. */
const GROWTH_GOAL = 1.5;
const REMINDER_RUN_GOAL_MS = 3000;
const REMINDER_RUN_NOTHING_NEW_GOAL_MS = 200;

// ---- Arguments ----------------------------------------------------------------------------------------------
const arg = (name: string, dflt: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : dflt;
};
const TOOLS = arg("tools", 20_000);
const ROUNDS = arg("rounds", 3);
const DURATION = arg("duration", 5);
/**
 * Seconds of load before each measured run, at the same concurrency, not measured (app and floor alike): what is
 * measured is a running server, not one whose code for that request the JavaScript engine is still compiling.
 * `--warmup 0` measures from the first request, as runs before 2026-12-04 did.
 */
const WARMUP = arg("warmup", 2);
const GROWTH = !process.argv.includes("--no-growth");
/** Keep a filled database of the same scale from an earlier run (with BENCH_DIR, scripts/bench.sh keeps the cluster). */
const REUSE = process.argv.includes("--reuse");
/** `--only status_lookup,check_sheet`: just those measures (a quicker look while working on one of them). */
const ONLY = (() => {
  const i = process.argv.indexOf("--only");
  return i > 0 ? new Set(process.argv[i + 1].split(",")) : null;
})();
const wanted = (name: string) => ONLY == null || ONLY.has(name);
const BUSY_TOOL = "B-000227"; // (227 × 37) mod 420 = 419: the tool whose latest calibration is the oldest

// ---- The register at a scale: each table its own step, set-based -----------------------------------------
/** The shape of the issue's large shop, for `tools` tools (20,000 → 100 families, 200,000 calibrations, ~2,000 open checkouts, ~400 holds, 5,000 sheets, 5,000,000 readings). */
function shapeOf(tools: number) {
  return { tools, families: Math.max(1, Math.round(tools / 200)), calibrationsPerTool: 10, sheets: Math.max(3, Math.round(tools / 4)), itemsPerSheet: 200, indexesPerItem: 5 };
}
type Shape = ReturnType<typeof shapeOf>;

/**
 * The judgement the app stores for a bench reading (journal 2.4990–2.5010 in, read 2.5001 and 2.5002), from the shared
 * judging, as SQL columns verdict, band, text, detail; the detail names each reading's own item and place.
 */
const benchJudgementSql = (() => {
  const item = { key: "J001", label: "Journal 1", kind: "journal" as const, min: 2.499, max: 2.501, serviceableMin: null, serviceableMax: null, boreKey: null, journalKey: null, stationKeys: null, radial: false, outOfRoundMax: null, expansionPerK: null, directions: 2, repeat: 5 };
  const { view } = judgeReading(item, { itemKey: "J001", index: 1, unit: "in", values: [2.5001, 2.5002] }, { tableUnit: "in", tableExpansionPerK: null });
  const lit = (v: string) => `'${v.replace(/'/g, "''")}'`;
  return `${lit(view.verdict)}, ${lit(String(view.band))}, ${lit(view.text)}, jsonb_set(jsonb_set(${lit(JSON.stringify(view))}::jsonb, '{itemKey}', to_jsonb(r.item_key)), '{index}', to_jsonb(r.index))`;
})();

const FILL: { name: string; sql: (s: Shape) => string }[] = [
  {
    name: "people",
    sql: () => `insert into users (email, name, role, password_hash) select r || '@bench.example', 'Bench ' || r, r, '${bcrypt.hashSync(PASSWORD, 4)}' from unnest(array['mechanic','crib','inspector','quality','auditor','admin']) r`,
  },
  { name: "families", sql: (s) => `insert into families (name, kind, unit, default_interval_days, mpe, resolution) select 'Bench family ' || lpad(g::text, 4, '0'), 'outside_micrometer', 'in', 365, 0.0001, 0.0001 from generate_series(1, ${s.families}) g` },
  {
    name: "tools",
    sql: (s) => `
      with f as (select id, row_number() over (order by name) - 1 as n from families)
      insert into tools (asset_tag, family_id, description, serial_number, unit, range_min, range_max, resolution, interval_days)
      select 'B-' || lpad(g::text, 6, '0'), f.id, 'Bench micrometer 2-3 in', 'SN-B' || g, 'in', 2, 3, 0.0001, 365
      from generate_series(1, ${s.tools}) g join f on f.n = g % ${s.families}`,
  },
  {
    // Ten yearly calibrations per tool; the latest between 0 and 420 days ago, so ~13 % are overdue and ~7 % due within 30 days.
    name: "calibrations",
    sql: (s) => `
      insert into calibrations (tool_id, performed_at, decision_rule, result, as_found_in_tolerance, interval_days, next_due_at)
      select t.id, c.at, 'simple', 'pass', true, 365, (c.at at time zone 'America/Chicago')::date + 365
      from (select id, substr(asset_tag, 3)::int as n from tools) t
      cross join generate_series(0, ${s.calibrationsPerTool - 1}) k
      cross join lateral (select now() - ((k * 365 + (t.n * 37) % 420) || ' days')::interval - interval '3 hours' as at) c`,
  },
  {
    // A shop of N tools has about N/100 mechanics, each holding about ten tools (the signed-in bench mechanic one of them).
    name: "mechanics",
    sql: (s) => `insert into users (email, name, role, password_hash) select 'mechanic' || g || '@bench.example', 'Bench mechanic ' || g, 'mechanic', 'x' from generate_series(1, ${Math.max(1, Math.round(s.tools / 100)) - 1}) g`,
  },
  {
    name: "checkouts",
    sql: () => `
      with m as (select id, row_number() over (order by email) - 1 as n, count(*) over () as k from users where role = 'mechanic')
      insert into checkouts (tool_id, user_id, issued_at, due_back_at)
      select t.id, m.id, now() - interval '2 hours', now() + interval '6 hours'
      from tools t join m on m.n = (substr(t.asset_tag, 3)::int / 10) % m.k where substr(t.asset_tag, 3)::int % 10 = 0`,
  },
  { name: "holds", sql: () => `insert into holds (tool_id, placed_at, reason) select id, now() - interval '1 day', 'Bench: dropped, to be checked' from tools where substr(asset_tag, 3)::int % 50 = 25` },
  {
    name: "limit table",
    sql: (s) => `
      with t as (insert into limit_tables (name, engine_model, unit, source_document, source_revision) values ('Bench journals', 'BENCH-1', 'in', 'Bench overhaul data (invented)', 'A') returning id)
      insert into limit_items (limit_table_id, seq, key, label, kind, min, max, directions, repeat)
      select t.id, g, 'J' || lpad(g::text, 3, '0'), 'Journal ' || g, 'journal', 2.4990, 2.5010, 2, ${s.indexesPerItem} from t, generate_series(1, ${s.itemsPerSheet}) g`,
  },
  {
    name: "check sheets",
    sql: (s) => `
      insert into jobs (limit_table_id, engine_serial, engine_model, work_order, opened_by, opened_at)
      select (select id from limit_tables limit 1), 'BE-' || lpad(g::text, 6, '0'), 'BENCH-1', 'WO-B' || g, (select id from users where role = 'inspector'), now() - ((g % 700) || ' days')::interval - interval '1 day'
      from generate_series(1, ${s.sheets}) g`,
  },
  {
    // A sheet's activity row and its people are kept by triggers per reading; five million of them in one statement
    // are filled set-based instead, below, as the migrations do for the sheets on record.
    name: "sheet activity off",
    sql: () => `alter table readings disable trigger readings_job_activity; alter table readings disable trigger readings_job_people`,
  },
  {
    // ~1,000 readings per sheet (items × indexes), each taken with one tool of the register.
    name: "readings",
    sql: (s) => `
      insert into readings (job_id, item_key, index, values, unit, size, verdict, taken_by, taken_at)
      select j.id, 'J' || lpad(i::text, 3, '0'), x, '["2.5001","2.5002"]'::jsonb, 'in', 2.50015, 'within_limits', (select id from users where role = 'inspector'), j.opened_at + (i * 10 + x) * interval '1 second'
      from jobs j cross join generate_series(1, ${s.itemsPerSheet}) i cross join generate_series(1, ${s.indexesPerItem}) x
      where j.engine_model = 'BENCH-1'`,
  },
  {
    // Spread by a hash over the register, except that one tool (${BUSY_TOOL}, whose last calibration is the oldest,
    // 419 days ago; a register of fewer than 227 tools has none) read the first journal on every third sheet:
    // ~5,000 readings since it was last known good at 20,000 tools, the busy micrometer whose loss opens the
    // investigation_open measure.
    name: "reading tools",
    sql: (s) => `
      with t as (select id, row_number() over (order by asset_tag) - 1 as n from tools),
      busy as (select id from tools where asset_tag = '${BUSY_TOOL}')
      insert into reading_tools (reading_id, tool_id, position, status_at_reading, due_at_reading, taken_at)
      select r.id, case when r.item_key = 'J001' and substr(j.work_order, 5)::int % 3 = 0 then coalesce((select id from busy), t.id) else t.id end,
        1, 'in_calibration', (r.taken_at at time zone 'America/Chicago')::date + 200, r.taken_at
      from readings r join jobs j on j.id = r.job_id join t on t.n = abs(hashtext(r.job_id::text || r.item_key)) % ${s.tools}`,
  },
  {
    name: "sheet activity",
    sql: () => `
      insert into job_activity (job_id, last_reading_at, readings) select job_id, max(taken_at), count(*) from readings group by job_id
      on conflict (job_id) do update set last_reading_at = excluded.last_reading_at, readings = excluded.readings;
      insert into job_people (job_id, user_id) select distinct job_id, taken_by from readings where taken_by is not null on conflict do nothing;
      alter table readings enable trigger readings_job_activity; alter table readings enable trigger readings_job_people`,
  },
  {
    // Each reading's stored judgement is what the app stores: the judged place of its values under the current rules.
    name: "reading judgements",
    sql: () => `
      insert into reading_judgements (reading_id, rules_version, verdict, band, text, detail, judged_at)
      select r.id, ${JUDGING_RULES_VERSION}, ${benchJudgementSql}, r.taken_at from readings r`,
  },
];
/**
 * Empty sheets the record_reading measure writes to (1,000 places each), made afresh for every run: one per second of
 * a round's load and one more, so every place a round writes is new up to 1,000 readings a second. Five a round ran
 * out on a fast run (about 750 a second), which wrapped round to places already read, and the app rightly refused
 * those with 409.
 */
const WRITE_SHEETS_PER_ROUND = Math.ceil(WARMUP + DURATION) + 1;
const writeSheetsSql = (run: string) => `
  insert into jobs (limit_table_id, engine_serial, engine_model, work_order, opened_by, opened_at)
  select (select id from limit_tables limit 1), 'BW-${run}-' || g, 'BENCH-1', 'WO-W${run}-' || g, (select id from users where role = 'inspector'), now() - interval '1 hour'
  from generate_series(1, ${ROUNDS * WRITE_SHEETS_PER_ROUND}) g returning id`;

async function countTools(url: string) {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    return Number((await c.query("select count(*) as n from tools")).rows[0].n);
  } finally {
    await c.end();
  }
}

async function fill(url: string, shape: Shape) {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    for (const step of FILL) {
      const t0 = performance.now();
      const r = await c.query(step.sql(shape));
      console.log(`  fill ${step.name}: ${r.rowCount ?? 0} rows, ${((performance.now() - t0) / 1000).toFixed(1)} s`);
    }
    const t0 = performance.now();
    await c.query("vacuum analyze");
    console.log(`  vacuum analyze: ${((performance.now() - t0) / 1000).toFixed(1)} s`);
    const size = (await c.query("select pg_size_pretty(pg_database_size(current_database())) as s")).rows[0].s;
    console.log(`  database size: ${size}`);
  } finally {
    await c.end();
  }
}

// ---- Processes ---------------------------------------------------------------------------------------------
/**
 * The app's Node.js flags: the server's own, as `npm start` gives them (SERVER_NODE_FLAGS, scripts/lib.sh), then any
 * for this run alone, e.g. BENCH_APP_NODE_ARGS="--cpu-prof --cpu-prof-dir=/tmp/prof" to profile it.
 */
const appNodeArgs = `${process.env.SERVER_NODE_FLAGS ?? ""} ${process.env.BENCH_APP_NODE_ARGS ?? ""}`.split(" ").filter(Boolean);
function startChild(kind: "app" | "floor", env: Record<string, string>): Promise<{ child: ChildProcess; url: string }> {
  const child =
    kind === "app"
      ? spawn(process.execPath, [...appNodeArgs, "--input-type=module", "-e", `const m = await import(${JSON.stringify(path.join(ROOT, "dist/server/server/index.js"))}); const r = await m.startServer(); process.on("SIGTERM", () => process.exit(0)); process.send({ url: r.url });`], {
          env: { ...process.env, ...env },
          stdio: ["ignore", "inherit", "inherit", "ipc"],
        })
      : fork(path.join(ROOT, "scripts/bench-floor.mjs"), [], { env: { ...process.env, ...env }, stdio: ["ignore", "inherit", "inherit", "ipc"] });
  return new Promise((resolve, reject) => {
    child.once("message", (m: { url?: string; port?: number }) => resolve({ child, url: m.url ?? `http://127.0.0.1:${m.port}` }));
    child.once("exit", (code) => reject(new Error(`${kind} stopped (exit ${code}) before it was ready`)));
  });
}
const freePort = () =>
  new Promise<number>((resolve) => {
    import("node:net").then(({ createServer }) => {
      const s = createServer();
      s.listen(0, "127.0.0.1", () => {
        const p = (s.address() as { port: number }).port;
        s.close(() => resolve(p));
      });
    });
  });

// ---- Signing in as the browser does (CSRF token, session cookie) -------------------------------------------
async function signIn(base: string, role: string) {
  const first = await fetch(`${base}/api/auth/csrf`);
  const cookie0 = first.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  const { token } = (await first.json()) as { token: string };
  const res = await fetch(`${base}/api/auth/login`, {
    method: "POST",
    headers: { "content-type": "application/json", cookie: cookie0, "x-csrf-token": token },
    body: JSON.stringify({ email: `${role}@bench.example`, password: PASSWORD }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${role}: ${res.status} ${await res.text()}`);
  const cookie = res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ") || cookie0;
  const { csrfToken } = (await res.json()) as { csrfToken: string };
  return { cookie, "x-csrf-token": csrfToken };
}

// ---- Driving: autocannon, p95 from every response's time ---------------------------------------------------
async function drive(base: string, m: { connections: number; method?: string; path: () => string; body?: () => object; headers: Record<string, string> }) {
  if (WARMUP > 0) await load(base, m, WARMUP);
  return load(base, m, DURATION);
}

async function load(base: string, m: { connections: number; method?: string; path: () => string; body?: () => object; headers: Record<string, string> }, seconds: number) {
  const times: number[] = [];
  const codes = new Map<number, number>();
  const instance = autocannon(
    {
    url: base,
    connections: m.connections,
    duration: seconds,
    headers: { ...m.headers, "accept-encoding": "gzip", ...(m.body ? { "content-type": "application/json" } : {}) },
    requests: [{ method: (m.method ?? "GET") as "GET", setupRequest: (req) => ({ ...req, path: m.path(), ...(m.body ? { body: JSON.stringify(m.body()) } : {}) }) }],
    },
    () => undefined,
  );
  instance.on("response", (_client: unknown, status: number, _bytes: number, ms: number) => {
    times.push(ms);
    codes.set(status, (codes.get(status) ?? 0) + 1);
  });
  const result = await new Promise<autocannon.Result>((resolve) => instance.on("done", resolve));
  times.sort((a, b) => a - b);
  const p95 = times.length ? times[Math.min(times.length - 1, Math.floor(times.length * 0.95))] : NaN;
  return { p95, rps: result.requests.average, codes, n: times.length };
}

const median = (xs: number[]) => [...xs].map((x) => (Number.isNaN(x) ? Infinity : x)).sort((a, b) => a - b)[Math.floor(xs.length / 2)];
/** A run in which no answer came back within its duration prints as ">duration". */
const f = (x: number) => (Number.isFinite(x) ? x.toFixed(x < 10 ? 2 : 1) : `>${DURATION * 1000}`);

/** One measure's figures at one scale, a value per round: p95s, req/s, and answers by status code. */
type Result = { app: number[]; floor: number[]; appRps: number[]; floorRps: number[]; codes: Map<number, number> };

// ---- One scale -------------------------------------------------------------------------------------------
async function measureScale(tools: number) {
  const shape = shapeOf(tools);
  const name = `bench_${tools}`;
  console.log(`\n# ${tools} tools: filling ${name}`);
  const urls = await prepareDatabase({ adminUrl: `${BASE}/postgres`, database: name });
  const adminUrl = `${BASE}/${name}`;
  const t0 = performance.now();
  const filled = REUSE && (await countTools(adminUrl)) === shape.tools;
  if (filled) console.log(`  reusing the filled ${name}`);
  else {
    await fill(adminUrl, shape);
    console.log(`  filled in ${((performance.now() - t0) / 1000).toFixed(0)} s`);
  }

  const appPort = await freePort();
  const app = await startChild("app", {
    NODE_ENV: "production",
    DATABASE_URL: urls.runtimeUrl,
    PORT: String(appPort),
    HOST: "127.0.0.1",
    SESSION_SECRET: "bench-session-secret-0123456789abcdef",
    LOG_LEVEL: "warn",
    CRON_ENABLED: "false",
    COOKIE_SECURE: "false",
  });
  const floor = await startChild("floor", { DATABASE_URL: urls.runtimeUrl, PORT: "0" });
  const results = new Map<string, Result>();
  const extra: { investigation_open: number[]; investigation_gathered: number[]; reminder_run: number[]; reminder_run_nothing_new: number[] } = {
    investigation_open: [],
    investigation_gathered: [],
    reminder_run: [],
    reminder_run_nothing_new: [],
  };
  const batchPools: pg.Pool[] = [];
  try {
    const db = new pg.Client({ connectionString: adminUrl });
    await db.connect();
    const q = async <T>(sql: string) => (await db.query(sql)).rows as T[];
    const usable = (await q<{ asset_tag: string }>(`select asset_tag from tools where substr(asset_tag, 3)::int % 50 <> 25 and (substr(asset_tag, 3)::int * 37) % 420 < 300 order by asset_tag`)).map((r) => r.asset_tag);
    const allTags = (await q<{ asset_tag: string }>(`select asset_tag from tools`)).map((r) => r.asset_tag);
    const sheetId = (await q<{ id: string }>(`select id from jobs where work_order = 'WO-B${Math.ceil(shape.sheets / 2)}'`))[0].id;
    const writeSheets = (await q<{ id: string }>(writeSheetsSql(Date.now().toString(36)))).map((r) => r.id);
    const inv = await q<{ id: string }>(`select id from investigations order by opened_at desc limit 1`).catch(() => []);
    // The busy micrometer: each round it is reported lost, which opens an investigation over every reading it took
    // since it was last known good.
    const busy = (await q<{ id: string }>(`select id from tools where asset_tag = '${BUSY_TOOL}'`))[0]?.id ?? null;
    await db.end();

    const sessions = Object.fromEntries(await Promise.all((["mechanic", "quality", "inspector", "admin"] as const).map(async (r) => [r, await signIn(app.url, r)] as const)));
    const pick = <T>(xs: T[]) => xs[Math.floor(Math.random() * xs.length)];
    // The in-process batches (opening an investigation, the reminder run) run on one pool kept across the rounds, as
    // they do on the app's, which keeps its connections between requests (DB_IDLE_TIMEOUT_MS).
    const inProcess = createDb(urls.runtimeUrl, { max: 3, idleTimeoutMs: loadConfig({ DATABASE_URL: urls.runtimeUrl }).DB_IDLE_TIMEOUT_MS });
    batchPools.push(inProcess.pool);
    for (let round = 1; round <= ROUNDS; round++) {
      let place = 0;
      let current: Place | null = null;
      const roundSheets = writeSheets.slice((round - 1) * WRITE_SHEETS_PER_ROUND, round * WRITE_SHEETS_PER_ROUND);
      const perSheet = shape.itemsPerSheet * shape.indexesPerItem;
      const ctx: Ctx = {
        tag: () => pick(allTags),
        writeTag: () => pick(usable),
        sheetId,
        investigationId: inv[0]?.id ?? null,
        // Every place of the round's sheets once: item by item, then index by index, then the next sheet.
        nextPlace: () => {
          const p = place++;
          const onSheet = p % perSheet;
          current = {
            sheetId: roundSheets[Math.floor(p / perSheet) % roundSheets.length],
            itemKey: `J${String((onSheet % shape.itemsPerSheet) + 1).padStart(3, "0")}`,
            index: Math.floor(onSheet / shape.itemsPerSheet) + 1,
          };
          return current;
        },
        place: () => current!,
      };
      // Opening an investigation (in-process, as a lost-tool report or an out-of-tolerance calibration does inside its
      // own transaction): the finding, its window and, for a window of up to INLINE_READINGS readings, the re-judging of
      // every affected reading and the insert of the items; a larger window's are gathered after the finding commits.
      if (busy && wanted("investigation_open")) {
        const { db: idb, pool: ipool } = inProcess;
        const t = performance.now();
        const opened = await idb.transaction((tx) => onOutOfToleranceFinding(tx, { clock: systemClock, timeZone: "America/Chicago" }, { kind: "lost", toolId: busy, at: new Date(), actorId: null }));
        extra.investigation_open.push(performance.now() - t);
        if (opened) {
          // A window this large is gathered after the opening commits: timed until its last affected reading is written.
          for (;;) {
            const [{ gathering }] = (await ipool.query("select gathering from investigations where id = $1", [opened.investigationId])).rows;
            if (!gathering) break;
            await new Promise((r) => setTimeout(r, 5));
          }
          extra.investigation_gathered.push(performance.now() - t);
          ctx.investigationId = opened.investigationId;
          const [{ n }] = (await ipool.query("select count(*)::int as n from investigation_items where investigation_id = $1", [opened.investigationId])).rows;
          if (round === 1) console.log(`  investigation opened over the ${n} readings ${BUSY_TOOL} took since it was last known good`);
        }
      }
      for (const m of MEASURES) {
        if (m.path(ctx) === null || !wanted(m.name)) continue;
        place = 0;
        const r: Result = results.get(m.name) ?? { app: [], floor: [], appRps: [], floorRps: [], codes: new Map() };
        // Interleaved: the app, then the floor at the same concurrency, in every round.
        const a = await drive(app.url, { connections: m.connections, method: m.method, path: () => m.path(ctx)!, body: m.body && (() => m.body!(ctx)), headers: sessions[m.role] });
        const fl = await drive(floor.url, { connections: m.connections, path: () => `/floor/tools/${ctx.tag()}`, headers: {} });
        r.app.push(a.p95);
        r.floor.push(fl.p95);
        r.appRps.push(a.rps);
        r.floorRps.push(fl.rps);
        for (const [k, v] of a.codes) r.codes.set(k, (r.codes.get(k) ?? 0) + v);
        results.set(m.name, r);
      }
      // The due-reminder run over the whole register, a batch: its own time.
      if (!wanted("reminder_run")) continue;
      const config = loadConfig({ ...process.env, DATABASE_URL: urls.runtimeUrl, SESSION_SECRET: "bench-session-secret-0123456789abcdef", CRON_ENABLED: "false", SHOP_TIME_ZONE: "America/Chicago" });
      // Every round starts from no reminder on record (a throwaway database), so each round's run sends the whole
      // register's digests (in-process, to a mailer that counts them).
      const admin = new pg.Client({ connectionString: adminUrl });
      await admin.connect();
      await admin.query("delete from reminder_log");
      await admin.end();
      const { db: rdb, pool } = inProcess;
      let sent = 0;
      const t = performance.now();
      await sendDueReminders({ db: rdb, pool, clock: systemClock, mailer: { send: async () => void sent++ }, config, logger: pino({ level: "silent" }) }, "cli");
      extra.reminder_run.push(performance.now() - t);
      if (round === 1) console.log(`  reminder run sent ${sent} digest(s)`);
      // A run straight after has every reminder due already sent, the steady state of a scheduled run: the admin's
      // "Run reminders now" on the built app, so it sends nothing and still judges every tool that is due.
      const t2 = performance.now();
      const again = await fetch(`${app.url}/api/admin/jobs/reminders/run`, { method: "POST", headers: { ...sessions.admin, "content-type": "application/json" }, body: "{}", signal: AbortSignal.timeout(120_000) });
      const ran = (await again.json()) as { sent?: number; status?: string };
      extra.reminder_run_nothing_new.push(performance.now() - t2);
      if (again.status !== 200 || ran.sent !== 0) throw new Error(`the second reminder run answered ${again.status} ${JSON.stringify(ran)}`);
    }
  } finally {
    app.child.kill("SIGTERM");
    floor.child.kill("SIGTERM");
    await Promise.all(batchPools.map((p) => p.end()));
  }
  return { tools, results, extra };
}

// ---- Main ----------------------------------------------------------------------------------------------------
const large = await measureScale(TOOLS);
const small = GROWTH ? await measureScale(Math.round(TOOLS / 10)) : null;

console.log(`\n# ${TOOLS} tools, ${ROUNDS} round(s) of ${DURATION} s per measure (after ${WARMUP} s not measured); p95 = median over rounds`);
for (const m of MEASURES) {
  const r = large.results.get(m.name);
  if (!r) {
    console.log(`SKIP ${m.name} (nothing to measure on this database: ${m.name === "investigation_page" ? "no investigation" : "no path"})`);
    continue;
  }
  const app = median(r.app);
  const floor = median(r.floor);
  const failed = [...r.codes].filter(([c]) => c >= 400).map(([c, n]) => `${c}×${n}`).join(",");
  // The app's share of the floor's throughput is taken round by round (each app run beside the floor run right after
  // it, on the machine as it was then), then the median: this machine's own speed moves by more than the goal's
  // margin from minute to minute, which the ratio of two medians taken from different rounds mixed in.
  const share = median(r.appRps.map((a, i) => a / r.floorRps[i]));
  const rps = m.name === "status_lookup" ? ` app_rps=${f(median(r.appRps))} floor_rps=${f(median(r.floorRps))} share=${Math.round(share * 100)}%` : "";
  const ratio = Number.isFinite(app) ? f(app / floor) : `>${f((DURATION * 1000) / floor)}`;
  console.log(`RATIO ${m.name} app_p95=${f(app)} floor_p95=${f(floor)} ratio=${ratio} goal=${m.goal}${rps}${failed ? ` errors=${failed}` : ""}`);
}
// Opening an investigation, against the floor's p95 at one connection (the register list's floor runs).
const openMs = median(large.extra.investigation_open);
const floorOne = large.results.get("register_list") ? median(large.results.get("register_list")!.floor) : NaN;
console.log(
  Number.isFinite(openMs)
    ? `RATIO investigation_open app_p95=${f(openMs)} floor_p95=${f(floorOne)} ratio=${f(openMs / floorOne)} goal=${INVESTIGATION_OPEN_GOAL}`
    : `SKIP investigation_open (goal ×${INVESTIGATION_OPEN_GOAL}): no tool with readings`,
);
// Its affected readings, gathered after the opening commits when the window is large (no goal of its own: the time until
// the investigation page lists them all).
if (large.extra.investigation_gathered.length) console.log(`INFO investigation_gathered app_ms=${f(median(large.extra.investigation_gathered))}`);
if (large.extra.reminder_run.length) {
  console.log(`RATIO reminder_run app_ms=${f(median(large.extra.reminder_run))} goal_ms=${REMINDER_RUN_GOAL_MS}`);
  // Nothing new to send: every reminder due was sent by the run before (the issue's "nothing due" goal, on a register
  // that still has thousands of tools due, so the run still judges each of them).
  console.log(`RATIO reminder_run_nothing_new app_ms=${f(median(large.extra.reminder_run_nothing_new))} goal_ms=${REMINDER_RUN_NOTHING_NEW_GOAL_MS}`);
}
if (small) {
  // Growth is read as the goals are: each scale's app p95 over the floor's p95 in the same round (the floor, one indexed
  // lookup, stays flat with the register), median over the rounds, large over small. The two scales run minutes apart,
  // and this machine's own speed moves by up to half again in that time, so the ratio of the two absolute p95s (raw=)
  // mixes the machine's drift into the register's growth; it is printed beside, for reading, not judged.
  console.log(`\n# growth ${small.tools} → ${large.tools} tools, each scale's ratio to the floor in the same round (flat = 1; goal ≤ ${GROWTH_GOAL} for every per-tool and per-page measure)`);
  const floorRatio = (r: Result) => median(r.app.map((a, i) => a / r.floor[i]));
  for (const m of MEASURES) {
    const a = small.results.get(m.name);
    const b = large.results.get(m.name);
    if (!a || !b) continue;
    const growth = floorRatio(b) / floorRatio(a);
    const raw = median(b.app) / median(a.app);
    console.log(
      `GROWTH ${m.name} small_p95=${f(median(a.app))} large_p95=${f(median(b.app))} small_ratio=${f(floorRatio(a))} large_ratio=${f(floorRatio(b))} growth=${f(growth)} raw=${f(raw)} goal=${GROWTH_GOAL}`,
    );
  }
}
process.exit(0);
