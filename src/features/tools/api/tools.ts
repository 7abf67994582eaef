import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { CreateTool, LifecycleChange, ToolActionResult, ToolDetail, ToolLocations, ToolPage, ToolStatusResponse } from "../../../../shared/tools/tools.schemas";
import { cursorFromPageBefore } from "../../../lib/keyset-pages";

/** Register filters as they travel in the URL and to GET /api/tools. */
export interface ToolListParams {
  q?: string;
  status?: string;
  familyId?: string;
  location?: string;
  custodianId?: string;
  ownerType?: string;
  /** "false": every tool that may not be used, whatever the reason. */
  usable?: string;
  /** Still in calibration and due within N days from today (dashboard links). */
  dueWithinDays?: string;
  /** Due on or after / on or before a calendar date. */
  dueFrom?: string;
  dueTo?: string;
  sort?: string;
  page: number;
  pageSize: number;
}

export const toolKeys = {
  all: ["tools"] as const,
  list: (p: ToolListParams) => ["tools", "list", p] as const,
  detail: (tag: string) => ["tools", "detail", tag] as const,
  status: (tag: string) => ["tools", "status", tag] as const,
  locations: ["tools", "locations"] as const,
};

const clean = (p: Partial<ToolListParams>) => ({ ...p, sort: p.sort || undefined });

export const toolsQueryOptions = (p: ToolListParams) =>
  queryOptions({
    queryKey: toolKeys.list(p),
    // "Next" reads on from the last tool shown, by keyset, at the same cost on page 400 as on page 2.
    queryFn: ({ client }) => api.get<ToolPage>(`/api/tools${qs({ ...clean(p), after: cursorFromPageBefore(client, toolKeys.list, p) })}`),
    placeholderData: keepPreviousData,
  });
export const useTools = (p: ToolListParams) => useQuery(toolsQueryOptions(p));

/** The address of the register's current view as CSV (same filters and sort, every page). */
export function toolsCsvUrl(p: Omit<ToolListParams, "page" | "pageSize">): string {
  return `/api/tools${qs({ ...clean(p), format: "csv" })}`;
}

/** Every location named in the register: the choices of the location filter. */
export const useToolLocations = () =>
  useQuery({ queryKey: toolKeys.locations, queryFn: () => api.get<ToolLocations>("/api/tools/locations"), staleTime: 60_000 });

export const toolQueryOptions = (tag: string) => queryOptions({ queryKey: toolKeys.detail(tag), queryFn: () => api.get<ToolDetail>(`/api/tools/${encodeURIComponent(tag)}`) });
export const useTool = (tag: string) => useQuery(toolQueryOptions(tag));

export const useToolStatus = (tag: string) =>
  useQuery({ queryKey: toolKeys.status(tag), queryFn: () => api.get<ToolStatusResponse>(`/api/tools/${encodeURIComponent(tag)}/status`) });

const path = (tag: string, rest = "") => `/api/tools/${encodeURIComponent(tag)}${rest}`;

/** Anything that changes a tool changes the register, its page and its status: refresh them all. */
export function useToolInvalidation() {
  const qc = useQueryClient();
  return () => qc.invalidateQueries({ queryKey: toolKeys.all });
}

export function useCreateTool() {
  const invalidate = useToolInvalidation();
  return useMutation({ mutationFn: (input: CreateTool) => api.post<ToolDetail>("/api/tools", input), onSuccess: invalidate });
}

export function useQuarantine(tag: string) {
  const invalidate = useToolInvalidation();
  return useMutation({ mutationFn: (reason: string) => api.post<ToolActionResult>(path(tag, "/quarantine"), { reason }), onSuccess: invalidate });
}

export function useRelease(tag: string) {
  const invalidate = useToolInvalidation();
  return useMutation({ mutationFn: (reason: string) => api.post<ToolActionResult>(path(tag, "/release"), { reason }), onSuccess: invalidate });
}

export function useLifecycle(tag: string) {
  const invalidate = useToolInvalidation();
  return useMutation({ mutationFn: (change: LifecycleChange) => api.post<ToolActionResult>(path(tag, "/lifecycle"), change), onSuccess: invalidate });
}

export function useRejectElement(tag: string) {
  const invalidate = useToolInvalidation();
  return useMutation({
    mutationFn: ({ elementId, reason }: { elementId: string; reason: string }) => api.post<unknown>(path(tag, `/elements/${elementId}/reject`), { reason }),
    onSuccess: invalidate,
  });
}

/** Address of the tool's photo (GET), when it has one. */
export const toolPhotoUrl = (tag: string) => path(tag, "/photo");

export function useUploadToolPhoto(tag: string) {
  const invalidate = useToolInvalidation();
  return useMutation({
    mutationFn: (file: File) => {
      const form = new FormData();
      form.append("file", file);
      return api.upload<ToolDetail>(path(tag, "/photo"), form);
    },
    onSuccess: invalidate,
  });
}
