import { useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import type { Settings } from "../../../../shared/settings/settings.schemas";

// Same key as the settings page, so one fetch serves both; read here for the
// shop's time zone, which turns an instant into the calendar date due dates count from.
export const useShopSettings = () => useQuery({ queryKey: ["settings"], queryFn: () => api.get<Settings>("/api/settings"), staleTime: 60_000 });
