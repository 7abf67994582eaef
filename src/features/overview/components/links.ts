import type { ToolStatus } from "../../../../shared/tools/tool-status";

// Where each number on a dashboard leads: the filtered list it counts (query names shared with the list pages).
export const links = {
  toolsByStatus: (s: ToolStatus) => `/tools?status=${s}`,
  allTools: "/tools",
  dueWithin: (days: number) => `/tools?dueWithinDays=${days}`,
  overdue: "/tools?status=overdue",
  notReturned: "/crib/custody?overdue=true",
  openInvestigations: "/investigations?status=open",
  investigation: (id: string) => `/investigations/${id}`,
  openJobs: "/jobs?status=open",
  myOpenJobs: "/jobs?status=open&mine=true",
  investigationsAwaitingDisposition: "/investigations?status=open&awaitingDisposition=true",
  awaitingSignature: "/jobs?status=awaiting_signature",
  job: (id: string) => `/jobs/${id}`,
  tool: (tag: string) => `/tools/${encodeURIComponent(tag)}`,
  drift: (tag: string) => `/analysis/drift/${encodeURIComponent(tag)}`,
  family: (familyId: string) => `/analysis/intervals/${familyId}`,
  toolsOfFamily: (familyId: string) => `/tools?familyId=${familyId}`,
  dueWeek: (from: string, to: string) => `/tools?dueFrom=${from}&dueTo=${to}`,
};
