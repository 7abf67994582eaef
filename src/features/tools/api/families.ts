import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { CreateFamily, Family } from "../../../../shared/families/families.schemas";
import type { Page } from "../../../../shared/common/lists.schemas";

export interface FamilyListParams {
  q?: string;
  kind?: string;
  page?: number;
  pageSize?: number;
}

export const familyKeys = {
  all: ["families"] as const,
  list: (p: FamilyListParams) => ["families", "list", p] as const,
  detail: (id: string) => ["families", "detail", id] as const,
};

export const familiesQueryOptions = (p: FamilyListParams) =>
  queryOptions({
    queryKey: familyKeys.list(p),
    queryFn: () => api.get<Page<Family>>(`/api/families${qs({ ...p, page: p.page ?? 1, pageSize: p.pageSize ?? 50 })}`),
    placeholderData: keepPreviousData,
  });
export const useFamilies = (p: FamilyListParams) => useQuery(familiesQueryOptions(p));

/** Every family, for pickers (a shop has tens of families, not thousands). */
export const useAllFamilies = () => useFamilies({ pageSize: 500 });

export const familyQueryOptions = (id: string) => queryOptions({ queryKey: familyKeys.detail(id), queryFn: () => api.get<Family>(`/api/families/${id}`) });
export const useFamily = (id: string | null | undefined) => useQuery({ ...familyQueryOptions(id ?? ""), enabled: !!id });

export function useCreateFamily() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: CreateFamily) => api.post<Family>("/api/families", input), onSuccess: () => qc.invalidateQueries({ queryKey: familyKeys.all }) });
}
