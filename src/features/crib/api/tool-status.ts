import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import type { ToolStatus } from "../../../../shared/tools/tool-status";

/** The answer of GET /api/tools/:assetTag/status (api.md). */
export interface ToolStatusAnswer {
  assetTag: string;
  description?: string;
  status: ToolStatus;
  usable: boolean;
  reasons: string[];
  dueAt: string | null;
  custodian: { name: string; email?: string } | null;
}

export const toolStatusQueryOptions = (assetTag: string) =>
  queryOptions({
    queryKey: ["tools", "status", assetTag] as const,
    queryFn: () => api.get<ToolStatusAnswer>(`/api/tools/${encodeURIComponent(assetTag)}/status`),
    retry: false,
    // A phone held up at the bench should not show a stale answer for long.
    staleTime: 15_000,
    refetchOnWindowFocus: true,
  });

export const useToolStatus = (assetTag: string) => useQuery(toolStatusQueryOptions(assetTag));
