import { z } from "zod";
import { isValidTimeZone } from "../shared/common/dates";

// Every environment variable is read here, once; a wrong one stops the process
// with a message naming it.
const ConfigSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  HOST: z.string().default("127.0.0.1"),
  DATABASE_URL: z.string().url({ message: "DATABASE_URL must be a postgres:// URL" }),
  /** The owner role's URL, for migrations; the app itself runs as DATABASE_URL's (runtime) role. */
  DATABASE_OWNER_URL: z.string().url({ message: "DATABASE_OWNER_URL must be a postgres:// URL" }).optional(),
  DB_POOL_MAX: z.coerce.number().int().min(2).max(200).default(10),
  DB_STATEMENT_TIMEOUT_MS: z.coerce.number().int().min(0).default(30_000),
  DB_IDLE_IN_TRANSACTION_TIMEOUT_MS: z.coerce.number().int().min(0).default(15_000),
  DB_LOCK_TIMEOUT_MS: z.coerce.number().int().min(0).default(10_000),
  /** How long a pooled connection may stay idle before it is closed (see server/db/client.ts). */
  DB_IDLE_TIMEOUT_MS: z.coerce.number().int().min(1_000).default(10 * 60_000),
  SESSION_SECRET: z.string().min(16, "SESSION_SECRET must be at least 16 characters").default("tenthwise-dev-session-secret-change-me"),
  PUBLIC_URL: z.string().url().optional(),
  SHOP_TIME_ZONE: z.string().default("America/Chicago"),
  SMTP_URL: z.string().default("smtp://127.0.0.1:2525"),
  MAIL_FROM: z.string().default("Tenthwise <tenthwise@tenthwise.test>"),
  MAIL_CATCHER_URL: z.string().optional(),
  S3_ENDPOINT: z.string().optional(),
  S3_BUCKET: z.string().default("tenthwise"),
  S3_REGION: z.string().default("us-east-1"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info"),
  COOKIE_SECURE: z.enum(["true", "false"]).default("false").transform((v) => v === "true"),
  LOGIN_RATE_LIMIT: z.coerce.number().int().min(1).default(10),
  LOGIN_ADDRESS_RATE_LIMIT: z.coerce.number().int().min(1).default(30),
  CRON_ENABLED: z.enum(["true", "false"]).default("true").transform((v) => v === "true"),
  /** npm start seeds the invented demo shop into an empty database unless this is false (a shop starting for real). */
  SEED_DEMO: z.enum(["true", "false"]).default("true").transform((v) => v === "true"),
});

export type Config = z.infer<typeof ConfigSchema>;

/** Parses configuration from an environment; throws one readable error listing every bad variable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = ConfigSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Tenthwise configuration is not valid:\n${lines.join("\n")}`);
  }
  if (!isValidTimeZone(parsed.data.SHOP_TIME_ZONE)) {
    throw new Error(`Tenthwise configuration is not valid:\n  SHOP_TIME_ZONE: unknown time zone "${parsed.data.SHOP_TIME_ZONE}"`);
  }
  return parsed.data;
}

export { isValidTimeZone };
