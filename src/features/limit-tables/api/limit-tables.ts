import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { Page } from "../../../../shared/common/lists.schemas";
import type { CreateLimitTableInput, LimitTable, LimitTableListQuery, LimitTableSummary } from "../../../../shared/limit-tables/limit-tables.schemas";

export const limitTableKeys = {
  all: ["limit-tables"] as const,
  list: (p: LimitTableListQuery) => ["limit-tables", "list", p] as const,
  detail: (id: string) => ["limit-tables", "detail", id] as const,
};

export const limitTablesQueryOptions = (p: LimitTableListQuery) =>
  queryOptions({ queryKey: limitTableKeys.list(p), queryFn: () => api.get<Page<LimitTableSummary>>(`/api/limit-tables${qs(p as Record<string, string | number>)}`), placeholderData: keepPreviousData });
export const useLimitTables = (p: LimitTableListQuery) => useQuery(limitTablesQueryOptions(p));

export const limitTableQueryOptions = (id: string) => queryOptions({ queryKey: limitTableKeys.detail(id), queryFn: () => api.get<LimitTable>(`/api/limit-tables/${id}`) });
export const useLimitTable = (id: string | undefined) => useQuery({ ...limitTableQueryOptions(id ?? ""), enabled: !!id });

/** Create a table, or (with reviseId) a revision that supersedes it. */
export function useSaveLimitTable() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ input, reviseId }: { input: CreateLimitTableInput; reviseId?: string }) =>
      api.post<LimitTable>(reviseId ? `/api/limit-tables/${reviseId}/revisions` : "/api/limit-tables", input),
    onSuccess: () => qc.invalidateQueries({ queryKey: limitTableKeys.all }),
  });
}
