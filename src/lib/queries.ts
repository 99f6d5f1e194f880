import {
  queryOptions,
  useMutation,
  useQueryClient,
  type InvalidateQueryFilters,
  type QueryKey,
  type UseQueryOptions,
} from "@tanstack/react-query";
import type { z } from "zod";
import { api } from "./api-client";

type QueryExtras<S extends z.ZodType, K extends QueryKey> = Pick<
  UseQueryOptions<z.output<S>, Error, z.output<S>, K>,
  "staleTime" | "gcTime" | "refetchInterval" | "placeholderData"
>;

/**
 * The query most key factories hold: GET `path`, its answer checked by `schema`, cached under
 * `queryKey`; `extras` add how long it stays fresh or what shows while it reloads.
 */
export function getQuery<const K extends QueryKey, S extends z.ZodType>(
  queryKey: K,
  path: string,
  schema: S,
  extras: QueryExtras<S, K> = {},
) {
  // api.get's answer type is conditional on the schema, which TypeScript cannot resolve for a generic one.
  const queryFn = () => api.get(path, schema) as Promise<z.output<S>>;
  return queryOptions({ queryKey, queryFn, ...extras });
}

/**
 * A mutation after whose success every query `filters` match is read again; the mutation settles
 * once they are, so a screen that waits for it shows the new state.
 */
export function useRefreshingMutation<TVariables = void, TData = unknown>(
  mutationFn: (variables: TVariables) => Promise<TData>,
  filters: InvalidateQueryFilters,
) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn, onSuccess: () => queryClient.invalidateQueries(filters) });
}
