import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type {
  CloseInvestigationInput,
  CreateDispositionInput,
  Disposition,
  InvestigationDetail,
  InvestigationSummary,
} from "../../../../shared/investigations/investigations.schemas";
import type { Page } from "../../../../shared/common/lists.schemas";

export interface InvestigationListParams {
  toolAssetTag?: string;
  status?: string;
  jobId?: string;
  awaitingDisposition?: string;
  page: number;
  pageSize?: number;
}

export const investigationKeys = {
  all: ["investigations"] as const,
  list: (p: InvestigationListParams) => ["investigations", "list", p] as const,
  detail: (id: string) => ["investigations", "detail", id] as const,
};

/**
 * GET /api/investigations answers an array (api.md); the total of a paged list travels in X-Total-Count, so
 * the list is read with api.getWithTotal, which hands the page its { items, total }.
 */
function fetchInvestigations(p: InvestigationListParams): Promise<Page<InvestigationSummary>> {
  return api.getWithTotal<InvestigationSummary>(`/api/investigations${qs({ ...p, pageSize: p.pageSize ?? 50 })}`);
}

export const investigationsQueryOptions = (p: InvestigationListParams) =>
  queryOptions({ queryKey: investigationKeys.list(p), queryFn: () => fetchInvestigations(p), placeholderData: keepPreviousData });
export const useInvestigations = (p: InvestigationListParams) => useQuery(investigationsQueryOptions(p));

export const investigationQueryOptions = (id: string) =>
  queryOptions({ queryKey: investigationKeys.detail(id), queryFn: () => api.get<InvestigationDetail>(`/api/investigations/${id}`) });
export const useInvestigation = (id: string) => useQuery(investigationQueryOptions(id));

export const reportUrl = (id: string) => `/api/investigations/${id}/report.pdf`;

export function useAddDisposition(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateDispositionInput) => api.post<{ dispositions: Disposition[] }>(`/api/investigations/${id}/dispositions`, input),
    onSuccess: () => qc.invalidateQueries({ queryKey: investigationKeys.all }),
  });
}

export function useCloseInvestigation(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: CloseInvestigationInput) => api.post<{ id: string; status: string }>(`/api/investigations/${id}/close`, input),
    onSuccess: () => qc.invalidateQueries({ queryKey: investigationKeys.all }),
  });
}
