import { defineConfig } from "drizzle-kit";

export default defineConfig({
  dialect: "postgresql",
  schema: "./server/db/schema.ts",
  out: "./drizzle",
  // The session table belongs to connect-pg-simple, not to our migrations.
  tablesFilter: ["!session"],
  dbCredentials: { url: process.env.DATABASE_URL ?? "postgres://app@127.0.0.1:54329/tenthwise" },
});
