import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import { cursorFromPageBefore } from "../../../lib/keyset-pages";
import type { AuditPage } from "../../../../shared/audit/audit.schemas";

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
  queryOptions({
    queryKey: auditKeys.list(p),
    queryFn: ({ client }) => api.get<AuditPage>(`/api/audit${qs({ ...p, after: cursorFromPageBefore(client, auditKeys.list, p) })}`),
    placeholderData: keepPreviousData,
  });
export const useAudit = (p: AuditParams) => useQuery(auditQueryOptions(p));
export const useAuditFacets = () =>
  useQuery({ queryKey: auditKeys.facets, queryFn: () => api.get<{ entityTypes: string[]; entityTypeOptions: { value: string; label: string }[] }>("/api/audit/facets"), staleTime: 5 * 60_000 });
