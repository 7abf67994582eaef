import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { api, qs } from "../../../lib/api-client";
import type { CreateUserInput, UpdateUserInput, UserDetail } from "../../../../shared/users/users.schemas";
import type { Page } from "../../../../shared/common/lists.schemas";

export const userKeys = {
  all: ["users"] as const,
  list: (p: { q?: string; role?: string; page: number }) => ["users", "list", p] as const,
  people: (q: string) => ["users", "people", q] as const,
};

export const usersQueryOptions = (p: { q?: string; role?: string; page: number }) =>
  queryOptions({ queryKey: userKeys.list(p), queryFn: () => api.get<Page<UserDetail>>(`/api/users${qs({ ...p, pageSize: 50 })}`), placeholderData: keepPreviousData });

export const useUsers = (p: { q?: string; role?: string; page: number }) => useQuery(usersQueryOptions(p));

export interface Person {
  id: string;
  name: string;
  email: string;
  role: string;
  badgeCode: string | null;
}
/** Active people by name, e-mail or badge code (for pickers). */
export const usePeople = (q: string) =>
  useQuery({ queryKey: userKeys.people(q), queryFn: () => api.get<Page<Person>>(`/api/people${qs({ q, pageSize: 20 })}`), enabled: q.trim().length > 0 });

export function useCreateUser() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (input: CreateUserInput) => api.post<UserDetail>("/api/users", input), onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }) });
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, patch }: { id: string; patch: UpdateUserInput }) => api.patch<UserDetail>(`/api/users/${id}`, patch),
    onSuccess: () => qc.invalidateQueries({ queryKey: userKeys.all }),
  });
}

export function useResetPassword() {
  return useMutation({ mutationFn: ({ id, password }: { id: string; password: string }) => api.post<void>(`/api/users/${id}/password`, { password }) });
}
