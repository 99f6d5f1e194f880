import { useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { useQuery, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { Role } from "@shared/schemas/common";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { settingsQueries } from "@/features/settings/api/settings-queries";
import { SettingsTable } from "@/features/settings/components/settings-table";
import { SettingsDecision } from "@/features/settings/components/settings-decision";
import { ProposeSettingsForm } from "@/features/settings/components/propose-settings-form";
import { settingsSummary } from "@/features/settings/words";
import { Loaded } from "@/components/ui/query-state";
import { EntityScreenHeader } from "@/components/ui/entity-screen-header";
import { EmptyState } from "@/components/ui/table";
import { entityOf } from "@/lib/entity-choice";
import { plural } from "@/lib/format";

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const entities = await queryClient.ensureQueryData(entityQueries.all());
    const code = entityOf(entities, new URL(request.url).searchParams.get("entity"));
    // An unknown entity is said inside the screen rather than instead of it.
    if (code) await queryClient.ensureQueryData(settingsQueries.list(code)).catch(() => undefined);
    return null;
  };

const intro: Record<Role, string> = {
  admin:
    "The supervisor's settings that change capital, each dated and with the supervisor's reference. You propose a change; a chief risk officer approves it before it counts.",
  cro: "The supervisor's settings that change capital, each dated and with the supervisor's reference. An administrator proposes a change; you approve or reject it (never your own).",
  analyst: "The supervisor's settings that change capital, each dated and with the supervisor's reference. Read only.",
  treasury: "The supervisor's settings that change capital, each dated and with the supervisor's reference. Read only.",
  regulator: "",
};

export default function SettingsRoute() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const { data: entities } = useSuspenseQuery(entityQueries.all());
  const [search] = useSearchParams();
  const role = user!.role;
  const entity = entityOf(entities, search.get("entity"));
  const current = entities.find((e) => e.code === entity);
  const list = useQuery({ ...settingsQueries.list(entity), enabled: entity !== "" });
  const records = list.data ?? [];
  const proposed = records.filter((r) => r.status === "proposed");
  const inForce = records.find((r) => r.inForceToday);

  return (
    <section aria-labelledby="settings-title" className="flex flex-col gap-6">
      <EntityScreenHeader screen={paths.settings} titleId="settings-title" entities={entities} entity={entity}>
        {intro[role]}
      </EntityScreenHeader>
      {entities.length === 0 ? (
        <EmptyState title="No legal entities are set up yet">
          An administrator adds the entities; their supervisory settings are kept here.
        </EmptyState>
      ) : (
        <Loaded query={list} what="the settings">
          <p className="text-sm" data-testid="settings-in-force">
            {inForce ? (
              <>
                In force today: <span className="font-medium">{settingsSummary(inForce)}</span> ({inForce.reference}).
              </>
            ) : (
              "No approved settings record is in force today."
            )}{" "}
            {proposed.length > 0
              ? `${plural(proposed.length, "change waits", "changes wait")} for a chief risk officer's decision.`
              : "No change waits for a decision."}
          </p>
          {proposed.length > 0 && (
            <section aria-labelledby="waiting-title" className="flex flex-col gap-3">
              <h2 id="waiting-title">Waiting for a decision</h2>
              {proposed.map((r) => (
                <SettingsDecision
                  key={r.id}
                  record={r}
                  records={records}
                  entity={entity}
                  user={user!}
                  fallback={
                    current
                      ? {
                          pnlBasis: current.pnlBasis,
                          qualitativeAddend: current.qualitativeAddend,
                          qualitativeAddendSvar: null,
                          multiplierFloor: null,
                          determinationFrequency: "quarterly",
                        }
                      : null
                  }
                />
              ))}
            </section>
          )}
          <section aria-labelledby="records-title" className="flex flex-col gap-2">
            <h2 id="records-title">Dated records</h2>
            <SettingsTable records={records} entity={entity} />
          </section>
          {role === "admin" && current && (
            <section aria-labelledby="propose-title" className="flex flex-col gap-2 border-t border-rule pt-4">
              <h2 id="propose-title">Propose a change</h2>
              <ProposeSettingsForm key={entity} entity={entity} regime={current.regime} />
            </section>
          )}
        </Loaded>
      )}
    </section>
  );
}
