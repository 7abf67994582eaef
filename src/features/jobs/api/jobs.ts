import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { Page } from "../../../../shared/common/lists.schemas";
import type { CheckSheet, CreateJobInput, JobListQuery, JobSummary, SignerCertificate, SignJobInput } from "../../../../shared/jobs/jobs.schemas";
import type { CreateReadingInput, FeelerLeaves, ReadingResult, SupersedeReadingInput } from "../../../../shared/readings/readings.schemas";

export const jobKeys = {
  all: ["jobs"] as const,
  list: (p: JobListQuery) => ["jobs", "list", p] as const,
  sheet: (id: string) => ["jobs", "sheet", id] as const,
  leaves: (id: string, itemKey: string, setTag: string) => ["jobs", "leaves", id, itemKey, setTag] as const,
};

export const jobsQueryOptions = (p: JobListQuery) =>
  queryOptions({ queryKey: jobKeys.list(p), queryFn: () => api.get<Page<JobSummary>>(`/api/jobs${qs(p as Record<string, string | number>)}`), placeholderData: keepPreviousData });
export const useJobs = (p: JobListQuery) => useQuery(jobsQueryOptions(p));

export const checkSheetQueryOptions = (id: string) => queryOptions({ queryKey: jobKeys.sheet(id), queryFn: () => api.get<CheckSheet>(`/api/jobs/${id}`) });
export const useCheckSheet = (id: string) => useQuery(checkSheetQueryOptions(id));

/** The go and no-go leaves the server would pick for a feeler item from a set. */
export const useFeelerLeaves = (jobId: string, itemKey: string, setTag: string) =>
  useQuery({
    queryKey: jobKeys.leaves(jobId, itemKey, setTag),
    queryFn: () => api.get<FeelerLeaves>(`/api/jobs/${jobId}/feeler-leaves${qs({ itemKey, setTag })}`),
    enabled: setTag.trim().length > 2,
    retry: false,
  });

/** A tool's unit, so live sizes convert like the server's (best effort: the server decides). */
export const useToolUnit = (tag: string) =>
  useQuery({
    queryKey: ["tools", "detail", tag.toUpperCase()],
    queryFn: () => api.get<{ unit?: "in" | "mm"; tool?: { unit?: "in" | "mm" } }>(`/api/tools/${encodeURIComponent(tag.toUpperCase())}`),
    enabled: tag.trim().length > 2,
    retry: false,
    select: (t) => t.unit ?? t.tool?.unit ?? null,
  });

export function useOpenJob() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: CreateJobInput) => api.post<JobSummary>("/api/jobs", input), onSuccess: () => qc.invalidateQueries({ queryKey: jobKeys.all }) });
}

export function useRecordReading(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { input: CreateReadingInput; supersedeId?: string; reason?: string }) =>
      v.supersedeId
        ? api.post<ReadingResult>(`/api/readings/${v.supersedeId}/supersede`, { ...withoutPlace(v.input), reason: v.reason ?? "" } satisfies SupersedeReadingInput)
        : api.post<ReadingResult>(`/api/jobs/${jobId}/readings`, v.input),
    onSuccess: () => qc.invalidateQueries({ queryKey: jobKeys.all }),
  });
}

function withoutPlace(input: CreateReadingInput) {
  const { itemKey: _k, index: _i, ...rest } = input;
  return rest;
}

export function useSignJob(jobId: string) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: SignJobInput) => api.post<CheckSheet>(`/api/jobs/${jobId}/sign`, input), onSuccess: () => qc.invalidateQueries({ queryKey: jobKeys.all }) });
}

/** The signed-in inspector's certificate number from her user record (the sign-off form fills it in). */
export const useSignerCertificate = (enabled: boolean) =>
  useQuery({ queryKey: ["me", "inspector-certificate"], queryFn: () => api.get<SignerCertificate>("/api/me/inspector-certificate"), enabled, staleTime: 60_000 });
