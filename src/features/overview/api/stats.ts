import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import type { StatsDashboard, StatsInspection, StatsMine, StatsOverview } from "../../../../shared/stats/stats.schemas";

export const statsKeys = {
  all: ["stats"] as const,
  overview: ["stats", "overview"] as const,
  dashboard: ["stats", "dashboard"] as const,
  mine: ["stats", "mine"] as const,
  inspection: ["stats", "inspection"] as const,
};

// Dashboards refresh every minute while open: due dates and custody move during a shift.
const live = { refetchInterval: 60_000, staleTime: 30_000 };

export const overviewQueryOptions = queryOptions({ queryKey: statsKeys.overview, queryFn: () => api.get<StatsOverview>("/api/stats/overview"), ...live });
export const dashboardQueryOptions = queryOptions({ queryKey: statsKeys.dashboard, queryFn: () => api.get<StatsDashboard>("/api/stats/dashboard"), ...live });
export const mineQueryOptions = queryOptions({ queryKey: statsKeys.mine, queryFn: () => api.get<StatsMine>("/api/stats/mine"), ...live });
export const inspectionQueryOptions = queryOptions({ queryKey: statsKeys.inspection, queryFn: () => api.get<StatsInspection>("/api/stats/inspection"), ...live });

export const useDashboard = (enabled = true) => useQuery({ ...dashboardQueryOptions, enabled });
export const useMine = (enabled = true) => useQuery({ ...mineQueryOptions, enabled });
export const useInspection = (enabled = true) => useQuery({ ...inspectionQueryOptions, enabled });
