import { useEffect, useState } from "react";
import { useLocation } from "react-router-dom";
import { useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { Role } from "@shared/schemas/common";
import type { QueueItem } from "@shared/schemas/queue";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { queueQueries } from "@/features/queue/api/queue-queries";
import { QueueList } from "@/features/queue/components/queue-list";
import { SettingsDecision } from "@/features/queue/components/settings-decision";
import { FormMessage } from "@/components/ui/field";
import { CountedHeading, PageTitle } from "@/components/ui/page-title";
import { focusWhenShown } from "@/lib/focus";
import { plural } from "@/lib/format";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(queueQueries.list());
  return null;
};

const intro: Partial<Record<Role, string>> = {
  cro: "Everything waiting for your decision across every entity and quarter: quarters to sign off and to file, overshooting notices to send, exclusion requests and settings changes.",
  analyst:
    "Everything waiting for the reporting office across every entity and quarter: overshooting notices to draft, returned quarters, exceptions to explain, open findings and ended quarters without a snapshot.",
  admin: "Role changes another administrator proposed, waiting for a second administrator.",
  regulator: "Packs filed with you that you have not yet acknowledged.",
};

const emptyText: Partial<Record<Role, string>> = {
  cro: "A quarter appears here as soon as an analyst submits it; exclusion requests and settings changes as soon as they are made.",
  analyst: "Returned quarters, new exceptions and findings appear here as soon as they exist.",
  admin: "A role change proposed by another administrator appears here.",
  regulator: "A pack appears here as soon as a bank files it with you.",
};

/** The settings proposals in the list, decided on this screen (their links point here). */
function proposalsOf(items: QueueItem[]) {
  return items
    .filter((i) => i.kind === "settings_proposal")
    .flatMap((i) => {
      const m = /#settings-(\d+)$/.exec(i.href);
      return m ? [{ id: Number(m[1]), entity: i.entity }] : [];
    });
}

export default function WaitingRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: items, isFetching } = useSuspenseQuery(queueQueries.list());
  const { hash } = useLocation();
  const role = user!.role;
  const proposals = proposalsOf(items);
  const [done, setDone] = useState<string>();

  // A link to a proposal on this screen scrolls to it once it is drawn.
  useEffect(() => {
    if (hash) document.getElementById(hash.slice(1))?.scrollIntoView?.();
  }, [hash]);

  return (
    <section aria-labelledby="waiting-title" className="flex flex-col gap-4">
      <PageTitle>{paths.waiting.label}</PageTitle>
      <header className="flex flex-col gap-1 border-b border-rule pb-3">
        <CountedHeading id="waiting-title" count={plural(items.length, "item", "items")} loading={isFetching}>
          Waiting for me
        </CountedHeading>
        <p className="text-sm text-ink-muted">{intro[role]} Each line opens the place where it is done.</p>
      </header>
      <FormMessage tone="done" ref={focusWhenShown}>
        {done}
      </FormMessage>
      <QueueList items={items} empty={emptyText[role] ?? ""} />
      {proposals.length > 0 && (
        <section aria-labelledby="settings-decisions" className="flex flex-col gap-2 border-t border-rule pt-4">
          <h2 id="settings-decisions">Settings changes</h2>
          <p className="text-sm text-ink-muted">
            An administrator proposed these changes of an entity's supervisory settings; a chief risk officer who did
            not propose them approves or rejects each.
          </p>
          {proposals.map((p) => (
            <SettingsDecision key={p.id} entity={p.entity} id={p.id} onDone={setDone} />
          ))}
        </section>
      )}
    </section>
  );
}
