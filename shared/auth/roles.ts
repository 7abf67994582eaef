/** The six roles of a shop using Tenthwise. */
export const ROLES = ["mechanic", "crib", "inspector", "quality", "auditor", "admin"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  mechanic: "Mechanic",
  crib: "Tool crib attendant",
  inspector: "Inspector",
  quality: "Quality manager",
  auditor: "Auditor",
  admin: "Administrator",
};

/**
 * What each role may do. The server guards every write with these; the client
 * uses the same table only to hide what would be refused.
 */
export const PERMISSIONS = {
  "users.manage": ["admin"],
  "settings.write": ["admin"],
  "families.write": ["quality", "admin"],
  "standards.write": ["quality", "admin"],
  "labs.write": ["quality", "admin"],
  "tools.write": ["crib", "quality", "admin"],
  "calibrations.write": ["quality", "admin"],
  "calibrations.review": ["quality", "admin"],
  "checks.write": ["mechanic", "crib", "quality", "admin"],
  "holds.write": ["crib", "quality", "admin"],
  "lifecycle.write": ["crib", "quality", "admin"],
  "checkouts.write": ["crib", "admin"],
  "shipments.write": ["crib", "quality", "admin"],
  "labels.print": ["crib", "quality", "admin"],
  "limitTables.write": ["quality", "admin"],
  "jobs.create": ["quality", "inspector", "admin", "mechanic"],
  "readings.write": ["mechanic", "quality", "admin"],
  "readings.override": ["quality", "admin"],
  "jobs.sign": ["inspector", "admin"],
  "dispositions.write": ["quality", "inspector", "admin"],
  "investigations.close": ["quality", "admin"],
  "reminders.run": ["admin"],
  "outbox.read": ["admin"],
  "intervals.read": ["quality", "auditor", "admin"],
  "intervals.apply": ["quality", "admin"],
  "import.run": ["quality", "admin"],
  "audit.read": ["quality", "auditor", "admin"],
  // Gauge studies: quality sets them up; mechanics take them blind; values and results are read by those who judge them.
  "studies.write": ["quality", "admin"],
  "studies.read": ["quality", "inspector", "auditor", "admin"],
  "studies.take": ["mechanic"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

/** True when the role holds the permission. */
export function can(role: Role | null | undefined, permission: Permission): boolean {
  return !!role && (PERMISSIONS[permission] as readonly Role[]).includes(role);
}
