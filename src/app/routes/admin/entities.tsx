import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { paths } from "@/config/paths";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { EntityForm } from "@/features/entities/components/entity-form";
import { EntityListTable } from "@/features/entities/components/entity-list-table";
import { CountedHeading, PageTitle } from "@/components/ui/page-title";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(entityQueries.all());
  return null;
};

export default function EntitiesRoute() {
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="entities-title" className="flex flex-col gap-3">
        <PageTitle>Entities</PageTitle>
        <CountedHeading id="entities-title" count={`${entities.length} in total`}>
          Entities
        </CountedHeading>
        <p className="text-sm text-ink-muted">
          Open an entity to edit it and to manage its portfolios and holiday calendar.
        </p>
        <EntityListTable entities={entities} hrefFor={paths.adminEntity.href} />
      </section>
      <section className="border-t border-rule pt-5">
        <EntityForm mode="create" />
      </section>
    </div>
  );
}
