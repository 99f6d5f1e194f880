import { apiTokenListSchema, createdApiTokenSchema, type CreateApiTokenBody } from "@shared/schemas/api-token";
import { api } from "@/lib/api-client";
import { getQuery, useRefreshingMutation } from "@/lib/queries";

export const apiTokenQueries = {
  root: () => ["api-tokens"] as const,
  /** The signed-in person's own tokens, newest first (never a secret: that comes once, with the creation). */
  mine: () => getQuery([...apiTokenQueries.root(), "mine"], "/api/tokens", apiTokenListSchema),
};

/** Creates a token; the answer carries its secret, which the screen shows this once. */
export function useCreateApiToken() {
  return useRefreshingMutation((body: CreateApiTokenBody) => api.post("/api/tokens", body, createdApiTokenSchema), {
    queryKey: apiTokenQueries.root(),
  });
}

export function useRevokeApiToken() {
  return useRefreshingMutation((id: number) => api.del(`/api/tokens/${id}`), { queryKey: apiTokenQueries.root() });
}
