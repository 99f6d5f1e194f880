import { Link, useSearchParams } from "react-router-dom";
import { useQuery, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { Role } from "@shared/schemas/common";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { filingQueries } from "@/features/filings/api/filing-queries";
import { FilingDetail } from "@/features/filings/components/filing-detail";
import { FilingListTable } from "@/features/filings/components/filing-list-table";
import { TableDownloads } from "@/components/ui/table-downloads";
import { useRowOpening } from "@/components/ui/table";
import { FilingsStanding } from "@/features/filings/components/filings-standing";
import { FormMessage } from "@/components/ui/field";
import { CountedHeading, PageTitle } from "@/components/ui/page-title";
import { plural } from "@/lib/format";

function screenParams(search: URLSearchParams): { filing?: number } {
  const filing = Number(search.get("filing"));
  return { filing: Number.isInteger(filing) && filing > 0 ? filing : undefined };
}

export const clientLoader = (queryClient: QueryClient) => async () => {
  await Promise.all([
    queryClient.ensureQueryData(filingQueries.list()),
    // Only for the zone's name (FRTB says amber): the screen stands without it.
    queryClient.ensureQueryData(entityQueries.all()).catch(() => undefined),
  ]);
  return null;
};

const intro: Record<Role, string> = {
  regulator:
    "The quarterly packs filed with you for the entities assigned to you. Download each as it was sent, check its SHA-256, and acknowledge receipt.",
  analyst:
    "Every pack filed with the supervisors, and whether they acknowledged it. Read only: the chief risk officer files an approved quarter under Quarter close.",
  cro: "Every pack filed with the supervisors, and whether they acknowledged it. You file an approved quarter under Quarter close.",
  treasury: "",
  admin: "",
};

function emptyFor(role: Role) {
  if (role === "regulator")
    return {
      title: "No packs have been filed with you yet",
      next: "A bank's pack appears here as soon as it files a quarter of an entity assigned to you.",
    };
  return {
    title: "No quarter has been filed yet",
    next: (
      <>
        A chief risk officer files an approved quarter under <Link to={paths.snapshots.href()}>Quarter close</Link>; the
        pack then goes by e-mail to the entity's supervisor contacts and appears here.
      </>
    ),
  };
}

export default function FilingsRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: filings, isFetching } = useSuspenseQuery(filingQueries.list());
  const entities = useQuery(entityQueries.all());
  const [search] = useSearchParams();
  const params = screenParams(search);
  const role = user!.role;
  const regimeOf = (code: string) => entities.data?.find((e) => e.code === code)?.regime;
  const selected = params.filing !== undefined ? filings.find((f) => f.id === params.filing) : filings[0];
  const filingHref = (id: number) => paths.filings.href({ filing: id });
  const opening = useRowOpening(filingHref, selected?.id);

  return (
    <section aria-labelledby="filings-title" className="flex flex-col gap-5">
      <PageTitle>{paths.filings.label}</PageTitle>
      <header className="flex flex-col gap-1 border-b border-rule pb-3">
        <h1 id="filings-title">Filings</h1>
        <p className="text-sm text-ink-muted">{intro[role]}</p>
      </header>
      <FilingsStanding filings={filings} role={role} />
      <section aria-labelledby="filing-list-title" className="flex flex-col gap-2 border-t border-rule pt-4">
        <CountedHeading
          level={2}
          id="filing-list-title"
          count={plural(filings.length, "filing", "filings")}
          loading={isFetching}
        >
          Filed packs
        </CountedHeading>
        <FilingListTable filings={filings} {...opening} regimeOf={regimeOf} empty={emptyFor(role)} />
        {filings.length > 0 && <TableDownloads path="/api/filings" what="the filings" />}
      </section>
      {selected ? (
        <FilingDetail
          key={selected.id}
          filing={selected}
          role={role}
          regime={regimeOf(selected.entity)}
          filingHref={filingHref}
          related={filings.find(
            (f) =>
              (selected.amends !== null && f.snapshotId === selected.amends) ||
              (selected.amendedBy !== null && f.snapshotId === selected.amendedBy),
          )}
        />
      ) : (
        params.filing !== undefined && (
          <FormMessage>
            Filing #{params.filing} is not among the filings you can read.{" "}
            <Link to={paths.filings.href()}>Open the newest filing</Link>
          </FormMessage>
        )
      )}
    </section>
  );
}
