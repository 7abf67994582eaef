import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import type { ApplyIntervalInput, Drift, IntervalAnalysis, IntervalFamily } from "../../../../shared/intervals/intervals.schemas";

export const intervalKeys = {
  all: ["intervals"] as const,
  families: ["intervals", "families"] as const,
  analysis: (familyId: string) => ["intervals", "analysis", familyId] as const,
  drift: (assetTag: string) => ["intervals", "drift", assetTag] as const,
};

export const intervalFamiliesQueryOptions = queryOptions({ queryKey: intervalKeys.families, queryFn: () => api.get<IntervalFamily[]>("/api/intervals/families") });
export const intervalAnalysisQueryOptions = (familyId: string) =>
  queryOptions({ queryKey: intervalKeys.analysis(familyId), queryFn: () => api.get<IntervalAnalysis>(`/api/families/${familyId}/interval-analysis`) });
export const driftQueryOptions = (assetTag: string) =>
  queryOptions({ queryKey: intervalKeys.drift(assetTag), queryFn: () => api.get<Drift>(`/api/tools/${encodeURIComponent(assetTag)}/drift`) });

export const useIntervalFamilies = () => useQuery(intervalFamiliesQueryOptions);
export const useIntervalAnalysis = (familyId: string) => useQuery(intervalAnalysisQueryOptions(familyId));
export const useDrift = (assetTag: string) => useQuery(driftQueryOptions(assetTag));

/** Records an interval decision; the family's and its tools' intervals change, so those lists refresh. */
export function useApplyInterval(familyId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: ApplyIntervalInput) => api.post<{ toolsChanged: number }>(`/api/families/${familyId}/interval-decisions`, input),
    onSuccess: () => {
      for (const key of [intervalKeys.all, ["families"], ["tools"], ["stats"], ["audit"]]) qc.invalidateQueries({ queryKey: key });
    },
  });
}
