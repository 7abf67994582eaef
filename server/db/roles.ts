import pg from "pg";
import { runMigrations } from "./migrate";

// Two database roles (docs/decisions/011): the owner owns every table and runs the migrations; the app
// runs as a login role in the runtime group, which holds only SELECT, INSERT, UPDATE and DELETE — no
// ownership (so no ALTER TABLE … DISABLE TRIGGER), no TRUNCATE, no superuser (so no
// session_replication_role). Roles are cluster-wide; every database of the cluster uses the same three.
export const OWNER_ROLE = "tenthwise_owner";
export const RUNTIME_GROUP = "tenthwise_runtime";
export const RUNTIME_ROLE = "tenthwise_app";

/** A connection URL with another user, password or database. */
export function withCredentials(url: string, user: string, password?: string, database?: string): string {
  const u = new URL(url);
  u.username = encodeURIComponent(user);
  u.password = password ? encodeURIComponent(password) : "";
  if (database !== undefined) u.pathname = `/${encodeURIComponent(database)}`;
  return u.toString();
}

const ident = (s: string) => `"${s.replace(/"/g, '""')}"`;
const literal = (s: string) => `'${s.replace(/'/g, "''")}'`;

/** Tables only database triggers write (docs/decisions/013-indexed-status.md): read-only to the app. */
export const TRIGGER_KEPT_TABLES = ["tool_states", "tool_state_counts", "job_activity", "job_people", "investigation_tallies", "sheet_references"];

/** Takes back from the app every write on the trigger-kept tables that exist (run at every start and after migrating). */
const REVOKE_TRIGGER_KEPT_SQL = `DO $$ DECLARE t text; BEGIN
  FOREACH t IN ARRAY ARRAY[${TRIGGER_KEPT_TABLES.map((t) => `'${t}'`).join(", ")}] LOOP
    IF to_regclass('public.' || t) IS NOT NULL THEN
      EXECUTE format('REVOKE INSERT, UPDATE, DELETE, TRUNCATE ON %I FROM ${RUNTIME_GROUP}, ${RUNTIME_ROLE}', t);
    END IF;
  END LOOP;
END $$`;

/** The privileges the runtime role needs, on what exists now and on what the owner creates later. */
export const RUNTIME_GRANTS_SQL = [
  `GRANT USAGE ON SCHEMA public TO ${RUNTIME_GROUP}`,
  `GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO ${RUNTIME_GROUP}`,
  `GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO ${RUNTIME_GROUP}`,
  // Tables that later migrations add (from any branch) are granted as they are created.
  `ALTER DEFAULT PRIVILEGES FOR ROLE ${OWNER_ROLE} IN SCHEMA public GRANT SELECT, INSERT, UPDATE, DELETE ON TABLES TO ${RUNTIME_GROUP}`,
  `ALTER DEFAULT PRIVILEGES FOR ROLE ${OWNER_ROLE} IN SCHEMA public GRANT USAGE, SELECT ON SEQUENCES TO ${RUNTIME_GROUP}`,
  // Tables kept only by the database's own triggers (as the owner): the app reads them, never writes them.
  REVOKE_TRIGGER_KEPT_SQL,
];

export interface PrepareOptions {
  /** A superuser (or a role with CREATEROLE and CREATEDB) on the cluster, any database. */
  adminUrl: string;
  database: string;
  /** Set (or reset) the login passwords; omit for a cluster with trust authentication. */
  ownerPassword?: string;
  runtimePassword?: string;
  /** Apply the migrations as the owner (default true). */
  migrate?: boolean;
}

/**
 * Makes a database ready for the app: the roles (created when missing, passwords set when given), the
 * database owned by the owner role, every object in it owned by the owner (a database created before
 * the roles existed is taken over), the runtime grants, then the migrations run as the owner.
 * Idempotent: `npm start`, `npm test` and the quick test runner call it on every run.
 */
export async function prepareDatabase(opts: PrepareOptions): Promise<{ ownerUrl: string; runtimeUrl: string }> {
  const admin = new pg.Client({ connectionString: withCredentials(opts.adminUrl, new URL(opts.adminUrl).username, decodeURIComponent(new URL(opts.adminUrl).password), "postgres") });
  await admin.connect();
  try {
    // Two runs at once (quick tests in parallel) may both see a role missing: serialise on a lock.
    await admin.query("select pg_advisory_lock(7220451)");
    const exists = async (role: string) => (await admin.query("select 1 from pg_roles where rolname = $1", [role])).rowCount === 1;
    if (!(await exists(OWNER_ROLE))) await admin.query(`CREATE ROLE ${OWNER_ROLE} LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS`);
    if (!(await exists(RUNTIME_GROUP))) await admin.query(`CREATE ROLE ${RUNTIME_GROUP} NOLOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS`);
    if (!(await exists(RUNTIME_ROLE))) await admin.query(`CREATE ROLE ${RUNTIME_ROLE} LOGIN NOSUPERUSER NOCREATEDB NOCREATEROLE NOREPLICATION NOBYPASSRLS IN ROLE ${RUNTIME_GROUP}`);
    if (opts.ownerPassword) await admin.query(`ALTER ROLE ${OWNER_ROLE} PASSWORD ${literal(opts.ownerPassword)}`);
    if (opts.runtimePassword) await admin.query(`ALTER ROLE ${RUNTIME_ROLE} PASSWORD ${literal(opts.runtimePassword)}`);
    // The owner creates objects, so the runtime group must never be able to act as it.
    await admin.query(`REVOKE ${OWNER_ROLE} FROM ${RUNTIME_ROLE}`).catch(() => undefined);
    const db = await admin.query("select datname from pg_database where datname = $1", [opts.database]);
    if (db.rowCount === 0) await admin.query(`CREATE DATABASE ${ident(opts.database)} OWNER ${OWNER_ROLE}`);
    else await admin.query(`ALTER DATABASE ${ident(opts.database)} OWNER TO ${OWNER_ROLE}`);
    await admin.query("select pg_advisory_unlock(7220451)");
  } finally {
    await admin.end();
  }

  const inDb = new pg.Client({ connectionString: withCredentials(opts.adminUrl, new URL(opts.adminUrl).username, decodeURIComponent(new URL(opts.adminUrl).password), opts.database) });
  await inDb.connect();
  try {
    await inDb.query(`ALTER SCHEMA public OWNER TO ${OWNER_ROLE}`);
    await inDb.query(`REVOKE CREATE ON SCHEMA public FROM PUBLIC`);
    // A database first migrated by the cluster's bootstrap user (before the two roles) is handed over.
    await inDb.query(`
      DO $$
      DECLARE r record;
      BEGIN
        FOR r IN
          SELECT c.relname, c.relkind, n.nspname FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
          WHERE n.nspname IN ('public', 'drizzle') AND c.relkind IN ('r', 'p', 'v', 'm', 'S', 'f')
            AND pg_get_userbyid(c.relowner) <> '${OWNER_ROLE}'
            AND NOT (c.relkind = 'S' AND EXISTS (SELECT 1 FROM pg_depend d WHERE d.objid = c.oid AND d.deptype IN ('a', 'i')))
        LOOP
          EXECUTE format('ALTER %s %I.%I OWNER TO ${OWNER_ROLE}',
            CASE r.relkind WHEN 'v' THEN 'VIEW' WHEN 'm' THEN 'MATERIALIZED VIEW' WHEN 'S' THEN 'SEQUENCE' WHEN 'f' THEN 'FOREIGN TABLE' ELSE 'TABLE' END,
            r.nspname, r.relname);
        END LOOP;
        FOR r IN
          SELECT p.oid::regprocedure AS sig FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
          WHERE n.nspname = 'public' AND pg_get_userbyid(p.proowner) <> '${OWNER_ROLE}'
        LOOP
          EXECUTE format('ALTER ROUTINE %s OWNER TO ${OWNER_ROLE}', r.sig);
        END LOOP;
        IF EXISTS (SELECT 1 FROM pg_namespace WHERE nspname = 'drizzle') THEN
          EXECUTE 'ALTER SCHEMA drizzle OWNER TO ${OWNER_ROLE}';
        END IF;
      END $$`);
    for (const stmt of RUNTIME_GRANTS_SQL) await inDb.query(stmt);
  } finally {
    await inDb.end();
  }

  const ownerUrl = withCredentials(opts.adminUrl, OWNER_ROLE, opts.ownerPassword, opts.database);
  const runtimeUrl = withCredentials(opts.adminUrl, RUNTIME_ROLE, opts.runtimePassword, opts.database);
  if (opts.migrate !== false) {
    await runMigrations(ownerUrl);
    // A table a migration just created was granted to the app by default privileges: take the writes back.
    const owner = new pg.Client({ connectionString: ownerUrl });
    await owner.connect();
    try {
      await owner.query(REVOKE_TRIGGER_KEPT_SQL);
    } finally {
      await owner.end();
    }
  }
  return { ownerUrl, runtimeUrl };
}
