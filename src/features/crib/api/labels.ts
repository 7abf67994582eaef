import { queryOptions, useQuery } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { CalibrationLabel, DoNotUseTag } from "../../../../shared/checkouts/labels.schemas";

export const labelKeys = {
  calibration: (tags: string[], skip: number) => ["labels", "calibration", tags, skip] as const,
  doNotUse: (tag: string) => ["labels", "do-not-use", tag] as const,
};

export const calibrationLabelsPdfUrl = (tags: string[], skip = 0) => `/api/labels/calibration.pdf${qs({ assetTags: tags.join(","), skip: skip || undefined })}`;
export const doNotUsePdfUrl = (tag: string) => `/api/labels/do-not-use.pdf${qs({ assetTag: tag })}`;

export const useCalibrationLabels = (tags: string[], skip: number) =>
  useQuery(
    queryOptions({
      queryKey: labelKeys.calibration(tags, skip),
      queryFn: () => api.get<{ items: CalibrationLabel[] }>(`/api/labels/calibration${qs({ assetTags: tags.join(",") })}`),
      enabled: tags.length > 0,
    }),
  );

export const useDoNotUseTag = (tag: string) =>
  useQuery({ queryKey: labelKeys.doNotUse(tag), queryFn: () => api.get<DoNotUseTag>(`/api/labels/do-not-use${qs({ assetTag: tag })}`), enabled: !!tag, retry: false });
