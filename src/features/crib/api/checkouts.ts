import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { Page } from "../../../../shared/common/lists.schemas";
import type {
  Checkout,
  CheckoutListQuery,
  IssueResult,
  IssueToolInput,
  LostFoundInput,
  LostFoundResult,
  MyTool,
  ReturnResult,
  ZeroCheckInput,
} from "../../../../shared/checkouts/checkouts.schemas";

export const checkoutKeys = {
  all: ["checkouts"] as const,
  list: (q: CheckoutListQuery) => ["checkouts", "list", q] as const,
  mine: ["checkouts", "mine"] as const,
};
/** Tool status is cached by others under "tools"; crib writes change it, so they invalidate it too. */
const toolKeysRoot = ["tools"] as const;

export const checkoutsQueryOptions = (q: CheckoutListQuery) =>
  queryOptions({ queryKey: checkoutKeys.list(q), queryFn: () => api.get<Page<Checkout>>(`/api/checkouts${qs({ ...q })}`), placeholderData: keepPreviousData });
export const useCheckouts = (q: CheckoutListQuery, enabled = true) => useQuery({ ...checkoutsQueryOptions(q), enabled });

export const myToolsQueryOptions = queryOptions({ queryKey: checkoutKeys.mine, queryFn: () => api.get<{ items: MyTool[] }>("/api/me/tools") });
export const useMyTools = () => useQuery(myToolsQueryOptions);

function useInvalidateCrib() {
  const qc = useQueryClient();
  return () => Promise.all([qc.invalidateQueries({ queryKey: checkoutKeys.all }), qc.invalidateQueries({ queryKey: toolKeysRoot }), qc.invalidateQueries({ queryKey: ["shipments"] })]);
}

export function useIssueTool() {
  const invalidate = useInvalidateCrib();
  return useMutation({ mutationFn: (input: IssueToolInput) => api.post<IssueResult>("/api/checkouts", input), onSuccess: invalidate });
}

export interface ReturnRequest {
  id: string;
  condition: "ok" | "damaged";
  note?: string;
  photo?: File | null;
  zeroCheck?: ZeroCheckInput;
}

/** A return goes as JSON, or as multipart when a photo comes with it. */
export function useReturnTool() {
  const invalidate = useInvalidateCrib();
  return useMutation({
    mutationFn: ({ id, photo, ...body }: ReturnRequest) => {
      if (!photo) return api.post<ReturnResult>(`/api/checkouts/${id}/return`, body);
      const form = new FormData();
      form.set("condition", body.condition);
      if (body.note) form.set("note", body.note);
      if (body.zeroCheck) form.set("zeroCheck", JSON.stringify(body.zeroCheck));
      form.set("photo", photo);
      return api.upload<ReturnResult>(`/api/checkouts/${id}/return`, form);
    },
    onSuccess: invalidate,
  });
}

export function useLostFound() {
  const invalidate = useInvalidateCrib();
  return useMutation({
    mutationFn: ({ assetTag, action, ...body }: LostFoundInput & { assetTag: string; action: "lost" | "found" }) =>
      api.post<LostFoundResult>(`/api/tools/${encodeURIComponent(assetTag)}/${action}`, body),
    onSuccess: invalidate,
  });
}

/** Retirement belongs to the register's lifecycle route (POST /api/tools/:assetTag/lifecycle); the crib only asks for it. */
export function useRetireTool() {
  const invalidate = useInvalidateCrib();
  return useMutation({
    mutationFn: ({ assetTag, reason }: { assetTag: string; reason: string }) => api.post<unknown>(`/api/tools/${encodeURIComponent(assetTag)}/lifecycle`, { lifecycle: "retired", reason }),
    onSuccess: invalidate,
  });
}
