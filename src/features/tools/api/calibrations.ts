import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { Calibration, CertificateReview, Chain, Check, CheckResult, ConditionalResult, CreateCalibration, CreateCheck, UploadedFile } from "../../../../shared/calibrations/calibrations.schemas";
import type { Page } from "../../../../shared/common/lists.schemas";
import { toolKeys } from "./tools";

const path = (tag: string, rest: string) => `/api/tools/${encodeURIComponent(tag)}${rest}`;

export const calibrationKeys = {
  all: ["calibrations"] as const,
  forTool: (tag: string) => ["calibrations", "tool", tag] as const,
  chain: (tag: string) => ["calibrations", "chain", tag] as const,
  checks: (tag: string) => ["checks", "tool", tag] as const,
};

/** A tool's calibration records, newest first, superseded ones included and marked. */
export const calibrationsQueryOptions = (tag: string) =>
  queryOptions({ queryKey: calibrationKeys.forTool(tag), queryFn: () => api.get<Page<Calibration>>(path(tag, `/calibrations${qs({ pageSize: 200 })}`)) });
export const useCalibrations = (tag: string) => useQuery(calibrationsQueryOptions(tag));

export const useChain = (tag: string) => useQuery({ queryKey: calibrationKeys.chain(tag), queryFn: () => api.get<Chain>(path(tag, "/chain")) });

export const useChecks = (tag: string) =>
  useQuery({ queryKey: calibrationKeys.checks(tag), queryFn: () => api.get<Page<Check>>(path(tag, `/checks${qs({ pageSize: 100 })}`)) });

/** A new record changes the tool's status, history and chain. */
function useRecordInvalidation() {
  const qc = useQueryClient();
  return () => Promise.all([qc.invalidateQueries({ queryKey: toolKeys.all }), qc.invalidateQueries({ queryKey: calibrationKeys.all }), qc.invalidateQueries({ queryKey: ["checks"] })]);
}

export function useCreateCalibration(tag: string) {
  const invalidate = useRecordInvalidation();
  return useMutation({ mutationFn: (input: CreateCalibration) => api.post<Calibration>(path(tag, "/calibrations"), input), onSuccess: invalidate });
}

/** Stores a calibration certificate (PDF or image) before the record is signed; the record then names its fileKey. */
export function useUploadCalibrationCertificate() {
  return useMutation({
    mutationFn: (file: File) => {
      const form = new FormData();
      form.append("file", file);
      return api.upload<UploadedFile>("/api/calibrations/certificate-files", form);
    },
  });
}

export function useReviewCalibration() {
  const invalidate = useRecordInvalidation();
  return useMutation({
    mutationFn: ({ calibrationId, review }: { calibrationId: string; review: CertificateReview }) => api.post<Calibration>(`/api/calibrations/${calibrationId}/review`, review),
    onSuccess: invalidate,
  });
}

export function useCreateCheck(tag: string) {
  const invalidate = useRecordInvalidation();
  return useMutation({ mutationFn: (input: CreateCheck) => api.post<CheckResult>(path(tag, "/checks"), input), onSuccess: invalidate });
}

/** As-found points within U of a limit, for the quality manager's review (server-paged, filtered). */
export const useConditionalResults = (q: { statement?: string; current?: string; page: number; pageSize?: number }) =>
  useQuery({
    queryKey: [...calibrationKeys.all, "conditional", q] as const,
    queryFn: () => api.get<Page<ConditionalResult>>(`/api/calibrations/conditional-results${qs({ statement: q.statement || undefined, current: q.current || undefined, page: q.page, pageSize: q.pageSize ?? 50 })}`),
  });
