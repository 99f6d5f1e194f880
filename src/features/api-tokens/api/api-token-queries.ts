import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
import { apiTokenListSchema, createdApiTokenSchema, type CreateApiTokenBody } from "@shared/schemas/api-token";
import { api } from "@/lib/api-client";

export const apiTokenQueries = {
  root: () => ["api-tokens"] as const,
  /** The signed-in person's own tokens, newest first (never a secret: that comes once, with the creation). */
  mine: () =>
    queryOptions({
      queryKey: [...apiTokenQueries.root(), "mine"] as const,
      queryFn: () => api.get("/api/tokens", apiTokenListSchema),
    }),
};

/** Creates a token; the answer carries its secret, which the screen shows this once. */
export function useCreateApiToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateApiTokenBody) => api.post("/api/tokens", body, createdApiTokenSchema),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: apiTokenQueries.root() }),
  });
}

export function useRevokeApiToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api.del(`/api/tokens/${id}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: apiTokenQueries.root() }),
  });
}
