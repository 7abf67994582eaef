import { keepPreviousData, queryOptions, useMutation, useQueries, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { AddCertificate, Certificate, CreateStandard, Standard, StandardDetail } from "../../../../shared/standards/standards.schemas";
import type { Page } from "../../../../shared/common/lists.schemas";

export interface StandardListParams {
  q?: string;
  kind?: string;
  inCalibration?: string;
  page: number;
  pageSize?: number;
}

export const standardKeys = {
  all: ["standards"] as const,
  list: (p: StandardListParams) => ["standards", "list", p] as const,
  detail: (id: string) => ["standards", "detail", id] as const,
};

export const standardsQueryOptions = (p: StandardListParams) =>
  queryOptions({
    queryKey: standardKeys.list(p),
    queryFn: () => api.get<Page<Standard>>(`/api/standards${qs({ ...p, pageSize: p.pageSize ?? 50 })}`),
    placeholderData: keepPreviousData,
  });
export const useStandards = (p: StandardListParams) => useQuery(standardsQueryOptions(p));

export const standardQueryOptions = (id: string) => queryOptions({ queryKey: standardKeys.detail(id), queryFn: () => api.get<StandardDetail>(`/api/standards/${id}`) });
export const useStandard = (id: string) => useQuery(standardQueryOptions(id));

/** Every standard with all its certificates (a shop keeps tens, not thousands): the calibration form judges each on the calibration's date. */
export function useStandardsWithCertificates() {
  const list = useStandards({ page: 1, pageSize: 500 });
  const details = useQueries({ queries: (list.data?.items ?? []).map((s) => standardQueryOptions(s.id)) });
  const ready = list.isSuccess && details.every((d) => d.isSuccess);
  return { isPending: list.isPending || details.some((d) => d.isPending), isError: list.isError, error: list.error, data: ready ? details.map((d) => d.data!) : [] };
}

/** The certificate that covers a calendar date (issued on or before it, due on or after it), if any. */
export function certificateOn(standard: { certificates: Certificate[] }, date: string): Certificate | null {
  return standard.certificates.find((c) => c.issuedAt <= date && date <= c.dueAt) ?? null;
}

export function useCreateStandard() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: CreateStandard) => api.post<StandardDetail>("/api/standards", input), onSuccess: () => qc.invalidateQueries({ queryKey: standardKeys.all }) });
}

export function useAddCertificate(standardId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: AddCertificate) => api.post<Certificate>(`/api/standards/${standardId}/certificates`, input),
    onSuccess: () => qc.invalidateQueries({ queryKey: standardKeys.all }),
  });
}

/** Attaches the certificate file (PDF or image) to a certificate. */
export function useUploadCertificateFile() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ standardId, certificateId, file }: { standardId: string; certificateId: string; file: File }) => {
      const form = new FormData();
      form.append("file", file);
      return api.upload<Certificate>(`/api/standards/${standardId}/certificates/${certificateId}/file`, form);
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: standardKeys.all }),
  });
}
