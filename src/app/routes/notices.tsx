import { Link, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { useQuery, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { Role } from "@shared/schemas/common";
import type { Entity } from "@shared/schemas/entity";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { noticeQueries } from "@/features/notices/api/notice-queries";
import { NoticeDetail } from "@/features/notices/components/notice-detail";
import { NoticeListTable } from "@/features/notices/components/notice-list-table";
import { Loaded } from "@/components/ui/query-state";
import { FormMessage } from "@/components/ui/field";
import { EntityScreenHeader } from "@/components/ui/entity-screen-header";
import { EmptyState, useRowOpening } from "@/components/ui/table";
import { entityOf } from "@/lib/entity-choice";
import { plural } from "@/lib/format";

/** Only entities under the EU rule set notify overshootings (docs/rules.md#overshooting-notice). */
const euOf = (entities: readonly Entity[]) => entities.filter((e) => e.regime === "eu");

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const entities = euOf(await queryClient.ensureQueryData(entityQueries.all()));
    const code = entityOf(entities, new URL(request.url).searchParams.get("entity"));
    if (code) await queryClient.ensureQueryData(noticeQueries.list(code)).catch(() => undefined);
    return null;
  };

const RULE = "An EU entity tells its supervisor of each overshooting within five working days (CRR Art. 366(5)).";
const intro: Partial<Record<Role, string>> = {
  analyst: `${RULE} You draft the cause; the chief risk officer sends the notice.`,
  cro: `${RULE} An analyst drafts the cause; you send the notice to the supervisor contacts.`,
};

export default function NoticesRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: all } = useSuspenseQuery(entityQueries.all());
  const [search] = useSearchParams();
  const role = user!.role;
  const entities = euOf(all);
  const entity = entityOf(entities, search.get("entity"));
  const current = entities.find((e) => e.code === entity);
  const list = useQuery({ ...noticeQueries.list(entity), enabled: entity !== "" });
  const notices = list.data ?? [];
  const asked = Number(search.get("notice"));
  const selected = Number.isInteger(asked) && asked > 0 ? notices.find((n) => n.id === asked) : notices[0];
  const open = notices.filter((n) => n.status === "open");
  const late = notices.filter((n) => n.late && n.status === "open");
  const opening = useRowOpening((id: number) => paths.notices.href({ entity, notice: id }), selected?.id);

  return (
    <section aria-labelledby="notices-title" className="flex flex-col gap-5">
      <EntityScreenHeader
        screen={paths.notices}
        titleId="notices-title"
        title="Overshooting notices"
        entities={entities}
        entity={entity}
        introClassName="max-w-3xl"
      >
        {intro[role]}
      </EntityScreenHeader>
      {entities.length === 0 ? (
        <EmptyState title="No entity reports under the EU rule set">
          Overshooting notices concern EU entities only; the other rule sets ask for none.
        </EmptyState>
      ) : (
        <Loaded query={list} what="the notices">
          <p className="text-sm" data-testid="notices-standing">
            {open.length === 0
              ? "No notice waits to be sent."
              : `${plural(open.length, "notice waits", "notices wait")} to be sent${
                  late.length ? `, ${plural(late.length, "of them late", "of them late")}` : ""
                }.`}
          </p>
          <NoticeListTable notices={notices} {...opening} />
          {selected ? (
            <NoticeDetail
              key={selected.id}
              notice={selected}
              role={role}
              recipients={current?.supervisorEmails ?? []}
              supervisorName={current?.supervisorName ?? null}
            />
          ) : (
            asked > 0 && (
              <FormMessage>
                Notice #{asked} is not among the notices of {entity}.{" "}
                <Link to={paths.notices.href({ entity })}>Open the newest notice</Link>
              </FormMessage>
            )
          )}
        </Loaded>
      )}
    </section>
  );
}
