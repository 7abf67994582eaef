import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type {
  AffectedItemsPage,
  CloseInvestigationInput,
  RemeasureCandidate,
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
  items: (id: string, p: AffectedItemsParams) => ["investigations", "items", id, p] as const,
  candidates: (id: string, itemId: string) => ["investigations", "candidates", id, itemId] as const,
};

/** The affected-items table's state, as the server reads it (sorted, filtered and paged there). */
export interface AffectedItemsParams {
  page: number;
  pageSize: number;
  sort?: string;
  couldChange?: string;
  verdict?: string;
  disposition?: string;
  jobId?: string;
  q?: string;
}

/**
 * GET /api/investigations answers an array (api.md); the total of a paged list travels in X-Total-Count, so
 * the list is read with api.getWithTotal, which hands the page its { items, total }.
 */
function fetchInvestigations(p: InvestigationListParams): Promise<Page<InvestigationSummary>> {
  return api.getWithTotal<InvestigationSummary>(`/api/investigations${qs({ ...p, pageSize: p.pageSize ?? 50 })}`);
}

export const investigationsQueryOptions = (p: InvestigationListParams) =>
  queryOptions({
    queryKey: investigationKeys.list(p),
    queryFn: () => fetchInvestigations(p),
    placeholderData: keepPreviousData,
    // While one on the page is still gathering its readings, its counts are asked for again every few seconds.
    refetchInterval: (query) => (query.state.data?.items.some((i) => i.gathering) ? 3000 : false),
  });
export const useInvestigations = (p: InvestigationListParams) => useQuery(investigationsQueryOptions(p));

export const investigationQueryOptions = (id: string) =>
  queryOptions({
    queryKey: investigationKeys.detail(id),
    queryFn: () => api.get<InvestigationDetail>(`/api/investigations/${id}`),
    // Just opened over a large window: asked again every second until its affected readings are all gathered.
    refetchInterval: (query) => (query.state.data?.gathering ? 1000 : false),
  });
export const useInvestigation = (id: string) => useQuery(investigationQueryOptions(id));

export const useInvestigationItems = (id: string, p: AffectedItemsParams) =>
  useQuery({
    queryKey: investigationKeys.items(id, p),
    queryFn: () => api.get<AffectedItemsPage>(`/api/investigations/${id}/items${qs({ ...p })}`),
    placeholderData: keepPreviousData,
  });

/** Later readings of an affected reading's place on its check sheet: what its remeasurement can be. */
export const useRemeasureCandidates = (id: string, itemId: string, enabled: boolean) =>
  useQuery({
    queryKey: investigationKeys.candidates(id, itemId),
    queryFn: () => api.get<RemeasureCandidate[]>(`/api/investigations/${id}/items/${itemId}/remeasure-candidates`),
    enabled,
  });

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
