import { MutationCache, QueryCache, QueryClient } from "@tanstack/react-query";
import { isApiError } from "@/lib/api-client";
import { authQueries } from "@/features/auth/api/auth-queries";

const isAuth = (key: readonly unknown[] | undefined) => key?.[0] === authQueries.all()[0];

export function createQueryClient(): QueryClient {
  // A 401 anywhere means the session has ended (signed out elsewhere, disabled, role changed):
  // forget the user so the layout sends the reader to sign-in, remembering the page.
  const onError = (error: unknown) => {
    if (isApiError(error) && error.status === 401) queryClient.setQueryData(authQueries.me().queryKey, null);
  };
  const queryClient: QueryClient = new QueryClient({
    queryCache: new QueryCache({ onError: (error, query) => isAuth(query.queryKey) || onError(error) }),
    mutationCache: new MutationCache({
      onError: (error, _vars, _ctx, mutation) => isAuth(mutation.options.mutationKey) || onError(error),
    }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // A 4xx will not change on retry; network blips and 5xx get one more try.
        retry: (failureCount, error) => {
          if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
          return failureCount < 1;
        },
        refetchOnWindowFocus: false,
      },
      mutations: { retry: false },
    },
  });
  return queryClient;
}
