import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { assignmentQueries } from "@/features/admin/api/assignment-queries";
import { userQueries } from "@/features/admin/api/user-queries";
import { AssignmentsPanel } from "@/features/admin/components/assignments-panel";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { PageTitle } from "@/components/ui/page-title";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await Promise.all([
    queryClient.ensureQueryData(assignmentQueries.all()),
    queryClient.ensureQueryData(userQueries.all()),
    queryClient.ensureQueryData(entityQueries.all()),
  ]);
  return null;
};

export default function AssignmentsRoute() {
  const { data: assignments } = useSuspenseQuery(assignmentQueries.all());
  const { data: users } = useSuspenseQuery(userQueries.all());
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  return (
    <section aria-labelledby="assignments-title" className="flex flex-col gap-3">
      <PageTitle>Regulator access</PageTitle>
      <h1 id="assignments-title">Regulator access</h1>
      <p className="text-sm text-ink-muted">
        A regulator user sees only the filed packs of the entities granted here. Removing access takes effect on their
        next request.
      </p>
      <AssignmentsPanel assignments={assignments} users={users} entities={entities} />
    </section>
  );
}
