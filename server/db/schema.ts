// Every Drizzle table, re-exported for drizzle-kit and for typed queries.
export * from "../modules/users/users.table";
export * from "../modules/settings/settings.table";
export * from "../modules/audit/audit.table";
export * from "../modules/families/families.table";
export * from "../modules/tools/tools.table";
export * from "../modules/labs/labs.table";
export * from "../modules/standards/standards.table";
export * from "../modules/calibrations/calibrations.table";
export * from "../modules/checks/checks.table";
export * from "../modules/checkouts/checkouts.table";
export * from "../modules/shipments/shipments.table";
export * from "../modules/limit-tables/limit-tables.table";
export * from "../modules/jobs/jobs.table";
export * from "../modules/readings/readings.table";
export * from "../modules/investigations/investigations.table";
export * from "../modules/reminders/reminders.table";
export * from "../modules/intervals/intervals.table";
