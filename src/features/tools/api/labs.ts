import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { CreateLab, Lab } from "../../../../shared/labs/labs.schemas";
import type { Page } from "../../../../shared/common/lists.schemas";

export const labKeys = {
  all: ["labs"] as const,
  list: (p: { q?: string; page: number; pageSize?: number }) => ["labs", "list", p] as const,
};

export const labsQueryOptions = (p: { q?: string; page: number; pageSize?: number }) =>
  queryOptions({ queryKey: labKeys.list(p), queryFn: () => api.get<Page<Lab>>(`/api/labs${qs({ ...p, pageSize: p.pageSize ?? 50 })}`), placeholderData: keepPreviousData });
export const useLabs = (p: { q?: string; page: number; pageSize?: number }) => useQuery(labsQueryOptions(p));
/** Every outside lab, for pickers. */
export const useAllLabs = () => useLabs({ page: 1, pageSize: 500 });

export function useCreateLab() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: CreateLab) => api.post<Lab>("/api/labs", input), onSuccess: () => qc.invalidateQueries({ queryKey: labKeys.all }) });
}
