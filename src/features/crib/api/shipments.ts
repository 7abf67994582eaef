import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { Page } from "../../../../shared/common/lists.schemas";
import type { CreateShipmentInput, LabOption, Shipment, ShipmentListQuery } from "../../../../shared/shipments/shipments.schemas";

export const shipmentKeys = {
  all: ["shipments"] as const,
  list: (q: ShipmentListQuery) => ["shipments", "list", q] as const,
  labs: ["shipments", "labs"] as const,
};

export const shipmentsQueryOptions = (q: ShipmentListQuery) =>
  queryOptions({ queryKey: shipmentKeys.list(q), queryFn: () => api.get<Page<Shipment>>(`/api/shipments${qs({ ...q })}`), placeholderData: keepPreviousData });
export const useShipments = (q: ShipmentListQuery) => useQuery(shipmentsQueryOptions(q));
export const useLabs = () => useQuery({ queryKey: shipmentKeys.labs, queryFn: () => api.get<{ items: LabOption[] }>("/api/shipments/labs") });

function useInvalidate() {
  const qc = useQueryClient();
  return () => Promise.all([qc.invalidateQueries({ queryKey: shipmentKeys.all }), qc.invalidateQueries({ queryKey: ["tools"] }), qc.invalidateQueries({ queryKey: ["checkouts"] })]);
}

export function useShipTools() {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: (input: CreateShipmentInput) => api.post<{ items: Shipment[] }>("/api/shipments", input), onSuccess: invalidate });
}

export function useReceiveShipment() {
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: (id: string) => api.post<Shipment>(`/api/shipments/${id}/receive`, {}), onSuccess: invalidate });
}
