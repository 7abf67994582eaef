/**
 * Words for the audit trail: every action and record type the server writes, in the shop's words.
 * tests/unit/audit-labels.test.ts reads every recordAudit call in server/ and jobs/ and fails when one lacks a label here.
 */

export const AUDIT_ACTION_LABELS = {
  "calibration.create": "Calibration recorded",
  "calibration.supersede": "Calibration corrected",
  "calibration.review": "Calibration certificate reviewed",
  "calibration.import": "Calibrations imported",
  "calibration.certificate.upload": "Calibration certificate attached",
  "check.record": "Check recorded",
  "check.pass": "Check passed",
  "check.fail": "Check failed",
  "checkout.issue": "Tool issued",
  "checkout.return": "Tool returned",
  "family.create": "Family added",
  "family.update": "Family changed",
  "family.import": "Families imported",
  "family.interval_change": "Family interval changed",
  "investigation.open": "Investigation opened",
  "investigation.gathered": "Affected readings gathered",
  "investigation.notified": "Investigation notice sent",
  "investigation.disposition": "Disposition recorded",
  "investigation.close": "Investigation closed",
  "job.create": "Check sheet opened",
  "job.sign": "Check sheet signed",
  "lab.create": "Lab added",
  "limit_table.create": "Limits table added",
  "limit_table.revise": "Limits table revised",
  "notification_preferences.update": "Reminder preferences changed",
  "reading.create": "Reading taken",
  "reading.supersede": "Reading corrected",
  "register.import": "Register imported",
  "reminders.run": "Reminders sent",
  "settings.update": "Settings changed",
  "shipment.ship": "Tool sent to a lab",
  "shipment.receive": "Tool back from the lab",
  "standard.create": "Standard added",
  "standard.certificate.add": "Standard certificate added",
  "standard.certificate.file": "Standard certificate file attached",
  "study.create": "Gauge study set up",
  "study.value": "Study value taken",
  "study.value.supersede": "Study value corrected",
  "tool.create": "Tool registered",
  "tool.update": "Tool details changed",
  "tool.import": "Tools imported",
  "tool.photo": "Tool photo added",
  "tool.quarantine": "Tool quarantined",
  "tool.release": "Tool released from quarantine",
  "tool.element.reject": "Set element rejected",
  "tool.lifecycle.active": "Tool back in use",
  "tool.lifecycle.inactive": "Tool set inactive",
  "tool.lifecycle.lost": "Tool reported lost",
  "tool.lifecycle.retired": "Tool retired",
  "user.create": "Person added",
  "user.update": "Person changed",
  "user.reset_password": "Password reset",
} as const satisfies Record<string, string>;
export type AuditAction = keyof typeof AUDIT_ACTION_LABELS;

export const AUDIT_RECORD_TYPE_LABELS = {
  calibration: "Calibration",
  checkout: "Checkout",
  family: "Tool family",
  file: "File",
  import: "Import",
  intermediate_check: "Intermediate check",
  investigation: "Investigation",
  job: "Check sheet",
  lab: "Lab",
  lab_shipment: "Lab shipment",
  limit_table: "Limits table",
  reading: "Reading",
  reminder_run: "Reminder run",
  set_element: "Set element",
  settings: "Shop settings",
  standard: "Standard",
  standard_certificate: "Standard certificate",
  study: "Gauge study",
  tool: "Tool",
  tool_hold: "Quarantine hold",
  user: "Person",
} as const satisfies Record<string, string>;
export type AuditRecordType = keyof typeof AUDIT_RECORD_TYPE_LABELS;

/** "Tool reported lost" for tool.lifecycle.lost; an action written before this table existed is made readable, never shown raw. */
export function auditActionLabel(action: string): string {
  return (AUDIT_ACTION_LABELS as Record<string, string>)[action] ?? humanise(action);
}

/** "Intermediate check" for intermediate_check. */
export function auditRecordTypeLabel(type: string): string {
  return (AUDIT_RECORD_TYPE_LABELS as Record<string, string>)[type] ?? humanise(type);
}

function humanise(code: string): string {
  const words = code.replace(/[._]+/g, " ").trim();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** What a record on the trail is called for people, and the page that shows it (null: no page of its own). */
export interface AuditRecordRef {
  title: string;
  path: string | null;
}

/** The page for a record: tool-bound records open their tool's page; the key is the asset tag or the record's own id. */
export function auditRecordPath(type: string, key: { id: string; toolTag?: string | null; jobId?: string | null; standardId?: string | null }): string | null {
  const tool = key.toolTag ? `/tools/${encodeURIComponent(key.toolTag)}` : null;
  switch (type) {
    case "tool":
      return `/tools/${encodeURIComponent(key.id)}`;
    case "calibration":
    case "checkout":
    case "intermediate_check":
    case "tool_hold":
    case "set_element":
      return tool;
    case "investigation":
      return `/investigations/${key.id}`;
    case "job":
      return `/jobs/${key.id}`;
    case "reading":
      return key.jobId ? `/jobs/${key.jobId}` : null;
    case "limit_table":
      return `/limit-tables/${key.id}`;
    case "standard":
      return `/standards/${key.id}`;
    case "standard_certificate":
      return key.standardId ? `/standards/${key.standardId}` : null;
    case "study":
      return `/studies/${key.id}`;
    case "family":
      return "/families";
    case "lab":
      return "/labs";
    case "lab_shipment":
      return tool ?? "/crib/shipments";
    case "reminder_run":
      return "/admin/reminders";
    case "settings":
      return "/admin/settings";
    case "import":
      return "/analysis/transfers";
    default:
      return null;
  }
}
