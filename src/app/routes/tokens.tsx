import { useState } from "react";
import { useQuery, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { CreatedApiToken } from "@shared/schemas/api-token";
import { paths } from "@/config/paths";
import { apiTokenQueries } from "@/features/api-tokens/api/api-token-queries";
import { CreateTokenForm } from "@/features/api-tokens/components/create-token-form";
import { NewTokenSecret } from "@/features/api-tokens/components/new-token-secret";
import { TokensTable } from "@/features/api-tokens/components/tokens-table";
import { entityQueries } from "@/features/entities/api/entity-queries";
import { CountedHeading, PageTitle } from "@/components/ui/page-title";
import { plural } from "@/lib/format";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await Promise.all([
    queryClient.ensureQueryData(apiTokenQueries.mine()),
    // Only for the example command: the screen works without it.
    queryClient.ensureQueryData(entityQueries.all()).catch(() => undefined),
  ]);
  return null;
};

/** Treasury's personal API tokens: what they hold, a new one (its secret shown once), and revocation. */
export default function TokensRoute() {
  const { data: tokens } = useSuspenseQuery(apiTokenQueries.mine());
  const { data: entities } = useQuery(entityQueries.all());
  const [created, setCreated] = useState<CreatedApiToken>();
  const active = tokens.filter((t) => t.status === "active").length;

  return (
    <div className="flex max-w-5xl flex-col gap-6">
      <PageTitle>{paths.tokens.label}</PageTitle>
      <section aria-labelledby="tokens-title" className="flex flex-col gap-3">
        <header className="flex flex-col gap-1 border-b border-rule pb-3">
          <CountedHeading
            id="tokens-title"
            count={
              <>
                {active === 0 ? "No active token" : plural(active, "active token", "active tokens")}
                {tokens.length > active ? ` · ${tokens.length - active} expired or revoked` : ""}
              </>
            }
            countProps={{ "data-testid": "tokens-standing" }}
          >
            API tokens
          </CountedHeading>
          <p className="text-sm text-ink-muted">
            A token lets a script read Quartermark as you: capital history, forecasts and what-if results, with your
            current role. Tokens only read: to change anything, sign in here. A token stops working when it expires,
            when you revoke it, or if your account is disabled or moved out of treasury.
          </p>
        </header>
        {created && (
          <NewTokenSecret
            token={created}
            entityCode={entities?.[0]?.code}
            origin={window.location.origin}
            onDone={() => setCreated(undefined)}
          />
        )}
        <TokensTable tokens={tokens} />
      </section>
      <section className="max-w-2xl border-t border-rule pt-5">
        <CreateTokenForm onCreated={setCreated} />
      </section>
      <section aria-labelledby="tokens-use-title" className="flex max-w-3xl flex-col gap-1 text-sm text-ink-soft">
        <h2 id="tokens-use-title" className="text-sm">
          From a script
        </h2>
        <p>
          Send the token in the header <code className="text-xs">Authorization: Bearer &lt;token&gt;</code>. It reads
          what you read: for example{" "}
          <code className="text-xs">GET /api/entities/&lt;entity code&gt;/capital/history</code> or{" "}
          <code className="text-xs">…/capital/forecast?date=YYYY-MM-DD</code>, and the what-if as{" "}
          <code className="text-xs">POST …/capital/what-if</code> with its parameters in JSON. Anything that would
          change data is refused with 403; a token that has expired or was revoked is refused with 401.
        </p>
      </section>
    </div>
  );
}
