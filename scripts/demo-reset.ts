import pg from "pg";
import { DEMO_MARK } from "../server/seed";

// npm run demo:reset (scripts/demo-reset.sh): drops the npm start database when, and only when, the demo
// seed made it (its settings carry the seed's marker) and no one is connected to it.
const adminUrl = process.env.DATABASE_ADMIN_URL;
const name = process.env.DATABASE_NAME ?? "tenthwise";
if (!adminUrl) {
  process.stderr.write("demo-reset: DATABASE_ADMIN_URL is not set (npm run demo:reset sets it for the npm start data folder)\n");
  process.exit(2);
}

async function withClient<T>(database: string, work: (c: pg.Client) => Promise<T>): Promise<T> {
  const url = new URL(adminUrl!);
  url.pathname = `/${database}`;
  const c = new pg.Client({ connectionString: url.toString() });
  await c.connect();
  try {
    return await work(c);
  } finally {
    await c.end();
  }
}

const exists = await withClient("postgres", async (c) => (await c.query("select 1 from pg_database where datname = $1", [name])).rowCount === 1);
if (!exists) {
  process.stdout.write(`No database "${name}": nothing to reset; npm start seeds the demo shop on its first run.\n`);
  process.exit(0);
}
const isDemo = await withClient(name, async (c) => {
  const table = await c.query("select to_regclass('public.settings') as t");
  if (!table.rows[0].t) return false;
  return (await c.query("select 1 from settings where key = $1", [DEMO_MARK])).rowCount === 1;
});
if (!isDemo) {
  process.stderr.write(`refused: "${name}" was not made by the demo seed (no demo marker in its settings); it is left as it is.\n`);
  process.exit(1);
}
const code = await withClient("postgres", async (c) => {
  const others = await c.query("select count(*)::int as n from pg_stat_activity where datname = $1 and pid <> pg_backend_pid()", [name]);
  if (others.rows[0].n > 0) {
    process.stderr.write(`refused: ${others.rows[0].n} connection(s) to "${name}" are open: stop npm start (Ctrl-C) first.\n`);
    return 1;
  }
  await c.query(`drop database "${name.replaceAll('"', '""')}"`);
  process.stdout.write(`Dropped the demo database "${name}".\n`);
  return 0;
});
process.exit(code);
