import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { AuditPage } from "../../../../shared/audit/audit.schemas";

export interface AuditParams {
  actorId?: string;
  entityType?: string;
  entityId?: string;
  from?: string;
  to?: string;
  page: number;
  pageSize: number;
  /** The page before's nextCursor, when known: the page is read on from there by keyset. */
  after?: string;
}

export const auditKeys = {
  all: ["audit"] as const,
  list: (p: AuditParams) => ["audit", "list", p] as const,
  facets: ["audit", "facets"] as const,
};

export const auditQueryOptions = (p: AuditParams) =>
  queryOptions({ queryKey: auditKeys.list(p), queryFn: () => api.get<AuditPage>(`/api/audit${qs({ ...p })}`), placeholderData: keepPreviousData });
export const useAudit = (p: AuditParams) => useQuery(auditQueryOptions(p));
export const useAuditFacets = () =>
  useQuery({ queryKey: auditKeys.facets, queryFn: () => api.get<{ entityTypes: string[]; entityTypeOptions: { value: string; label: string }[] }>("/api/audit/facets"), staleTime: 5 * 60_000 });
