import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { Page } from "../../../../shared/common/lists.schemas";
import type {
  CreateStudyInput,
  LatestStudy,
  MyStudy,
  RecordStudyValueInput,
  RecordStudyValueResult,
  StudyDetail,
  StudyGaps,
  StudyListQuery,
  StudySession,
  StudySummary,
  SupersedeStudyValueInput,
} from "../../../../shared/studies/studies.schemas";

export const studyKeys = {
  all: ["studies"] as const,
  list: (p: StudyListQuery) => ["studies", "list", p] as const,
  detail: (id: string) => ["studies", "detail", id] as const,
  mine: ["studies", "mine"] as const,
  session: (id: string) => ["studies", "session", id] as const,
  latest: (by: { familyId?: string; limitTableId?: string }) => ["studies", "latest", by] as const,
  gaps: ["studies", "gaps"] as const,
  mechanics: ["studies", "mechanics"] as const,
};

export const studiesQueryOptions = (p: StudyListQuery) =>
  queryOptions({ queryKey: studyKeys.list(p), queryFn: () => api.get<Page<StudySummary>>(`/api/studies${qs(p as Record<string, string | number>)}`), placeholderData: keepPreviousData });
export const useStudies = (p: StudyListQuery) => useQuery(studiesQueryOptions(p));

export const studyQueryOptions = (id: string) => queryOptions({ queryKey: studyKeys.detail(id), queryFn: () => api.get<StudyDetail>(`/api/studies/${id}`) });
export const useStudy = (id: string) => useQuery(studyQueryOptions(id));

export const useMyStudies = () => useQuery({ queryKey: studyKeys.mine, queryFn: () => api.get<MyStudy[]>("/api/studies/mine") });

export const useStudySession = (id: string) => useQuery({ queryKey: studyKeys.session(id), queryFn: () => api.get<StudySession>(`/api/studies/${id}/session`) });

/** Latest finished study per characteristic and family: by family (a tool's page) or by limits table (its items). */
export const useLatestStudies = (by: { familyId?: string; limitTableId?: string }) =>
  useQuery({ queryKey: studyKeys.latest(by), queryFn: () => api.get<LatestStudy[]>(`/api/studies/latest${qs(by)}`), enabled: !!(by.familyId || by.limitTableId) });

export const useStudyGaps = () => useQuery({ queryKey: studyKeys.gaps, queryFn: () => api.get<StudyGaps>("/api/studies/gaps") });

/** Active mechanics: the people who may be appraisers. */
export const useMechanics = () =>
  useQuery({ queryKey: studyKeys.mechanics, queryFn: () => api.get<Page<{ id: string; name: string; email: string }>>(`/api/people${qs({ role: "mechanic", pageSize: 200 })}`) });

export function useCreateStudy() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: CreateStudyInput) => api.post<StudyDetail>("/api/studies", input), onSuccess: () => qc.invalidateQueries({ queryKey: studyKeys.all }) });
}

/** Records the value for the prompt shown; the session, progress and every study view move on. */
export function useRecordStudyValue(id: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: RecordStudyValueInput) => api.post<RecordStudyValueResult>(`/api/studies/${id}/values`, input),
    onSuccess: () => qc.invalidateQueries({ queryKey: studyKeys.all }),
  });
}

export function useSupersedeStudyValue(studyId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ valueId, input }: { valueId: string; input: SupersedeStudyValueInput }) => api.post<RecordStudyValueResult>(`/api/study-values/${valueId}/supersede`, input),
    onSuccess: () => {
      qc.invalidateQueries({ queryKey: studyKeys.session(studyId) });
      qc.invalidateQueries({ queryKey: studyKeys.all });
    },
  });
}
