import { queryOptions, useQuery } from "@tanstack/react-query";
import { peopleSchema } from "@shared/schemas/user";
import { api } from "@/lib/api-client";

/** Everyone's name by e-mail, read once per session (GET /api/people); shared by every feature that shows people. */
export const peopleQuery = queryOptions({
  queryKey: ["people"] as const,
  queryFn: async () => new Map((await api.get("/api/people", peopleSchema)).map((p) => [p.email, p.name])),
  staleTime: 10 * 60_000,
});

/**
 * A person by name, their e-mail on hover; the e-mail itself until the names have loaded or when the person is not
 * known (an account removed). `fallback` stands in for no one.
 */
export function PersonName({ email, fallback = "—" }: { email: string | null | undefined; fallback?: string }) {
  const { data: names } = useQuery(peopleQuery);
  if (!email) return <>{fallback}</>;
  const name = names?.get(email);
  return name ? <span title={email}>{name}</span> : <>{email}</>;
}
