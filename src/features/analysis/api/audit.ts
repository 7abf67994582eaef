import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { AuditEvent } from "../../../../shared/audit/audit.schemas";
import type { Page } from "../../../../shared/common/lists.schemas";

export interface AuditParams {
  actorId?: string;
  entityType?: string;
  entityId?: string;
  from?: string;
  to?: string;
  page: number;
  pageSize: number;
}

export const auditKeys = {
  all: ["audit"] as const,
  list: (p: AuditParams) => ["audit", "list", p] as const,
  facets: ["audit", "facets"] as const,
};

export const auditQueryOptions = (p: AuditParams) =>
  queryOptions({ queryKey: auditKeys.list(p), queryFn: () => api.get<Page<AuditEvent>>(`/api/audit${qs({ ...p })}`), placeholderData: keepPreviousData });
export const useAudit = (p: AuditParams) => useQuery(auditQueryOptions(p));
export const useAuditFacets = () =>
  useQuery({ queryKey: auditKeys.facets, queryFn: () => api.get<{ entityTypes: string[]; entityTypeOptions: { value: string; label: string }[] }>("/api/audit/facets"), staleTime: 5 * 60_000 });
