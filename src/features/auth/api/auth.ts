import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, ApiError, setCsrfToken } from "../../../lib/api-client";
import type { LoginInput, User } from "../../../../shared/users/users.schemas";
import { can, ROLE_LABELS, type Permission } from "../../../../shared/auth/roles";

export const authKeys = { me: ["auth", "me"] as const };

/** The signed-in person, or null when nobody is. */
export const meQueryOptions = queryOptions({
  queryKey: authKeys.me,
  queryFn: async (): Promise<User | null> => {
    try {
      return (await api.get<{ user: User }>("/api/auth/me")).user;
    } catch (e) {
      if (e instanceof ApiError && e.status === 401) return null;
      throw e;
    }
  },
  staleTime: 5 * 60 * 1000,
});

export function useMe() {
  return useQuery(meQueryOptions);
}

/** The signed-in user; only inside the signed-in layout. */
export function useCurrentUser(): User {
  const { data } = useMe();
  if (!data) throw new Error("useCurrentUser outside the signed-in area");
  return data;
}

/** True when the signed-in role holds the permission (the server decides; this only hides what it would refuse). */
export function useCan(permission: Permission): boolean {
  const { data } = useMe();
  return can(data?.role, permission);
}

/** The signed-in role in words ("Auditor"), for pages that say what the role may not do. */
export function useRoleName(): string {
  const { data } = useMe();
  return data ? ROLE_LABELS[data.role] : "";
}

export function useLogin() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: LoginInput) => api.post<{ user: User; csrfToken: string }>("/api/auth/login", input),
    onSuccess: (res) => {
      setCsrfToken(res.csrfToken);
      qc.clear();
      qc.setQueryData(authKeys.me, res.user);
    },
  });
}

export function useLogout() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<void>("/api/auth/logout"),
    onSettled: () => {
      setCsrfToken(null);
      qc.clear();
      qc.setQueryData(authKeys.me, null);
    },
  });
}
