import { useSearchParams } from "react-router-dom";
import { useQuery, useQueryClient, type QueryClient } from "@tanstack/react-query";
import { paths } from "@/config/paths";
import { isOutboxUnavailable, outboxKeys, outboxQueries } from "@/features/outbox/api/outbox-queries";
import { OutboxListTable, outboxCountLine } from "@/features/outbox/components/outbox-list-table";
import { OutboxMessageView } from "@/features/outbox/components/outbox-message-view";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { PageTitle } from "@/components/ui/page-title";
import { useRowOpening } from "@/components/ui/table";
import { isApiError } from "@/lib/api-client";
import { formatDateTime } from "@/lib/format";

export const clientLoader = (queryClient: QueryClient) => async () => {
  // Outside development the server answers 404 on purpose: the screen says so rather than fail.
  await queryClient.ensureQueryData(outboxQueries.list()).catch(() => undefined);
  return null;
};

function DevelopmentOnly() {
  return (
    <span className="rounded-sm border border-ink-muted px-1.5 py-0.5 text-2xs font-semibold tracking-wide text-ink-soft uppercase">
      Development only
    </span>
  );
}

export default function OutboxRoute() {
  const [search] = useSearchParams();
  const queryClient = useQueryClient();
  const list = useQuery(outboxQueries.list());
  const messages = list.data?.messages ?? [];
  const wanted = search.get("message") ?? undefined;
  const selectedId = wanted ?? messages[0]?.id;
  const message = useQuery({
    ...outboxQueries.message(selectedId ?? ""),
    enabled: selectedId !== undefined && list.isSuccess,
  });
  const opening = useRowOpening((id: string) => paths.adminOutbox.href({ message: id }), selectedId);
  const newest = messages[0];

  return (
    <section aria-labelledby="outbox-title" className="flex flex-col gap-4">
      <PageTitle>{paths.adminOutbox.label}</PageTitle>
      <header className="flex flex-col gap-1 border-b border-rule pb-3">
        <div className="flex items-center gap-3">
          <h1 id="outbox-title">Outbox</h1>
          <DevelopmentOnly />
        </div>
        <p className="max-w-3xl text-sm text-ink-muted">
          The e-mails Quartermark sent from this machine, as the local mail sink kept them: each filing pack to a
          supervisor, exactly as it left. None of them reached a real mail server. In production Quartermark hands
          e-mail to the bank's mail server and this page does not exist.
        </p>
      </header>

      {list.isPending ? (
        <p className="text-sm text-ink-muted">Reading the mail sink…</p>
      ) : list.isError ? (
        isOutboxUnavailable(list.error) ? (
          <div role="status" className="max-w-2xl border-y border-rule py-4">
            <p className="text-sm font-medium">There is no outbox on this server</p>
            <p className="mt-1 text-sm text-ink-soft">{list.error.message}</p>
          </div>
        ) : (
          <FormMessage>{isApiError(list.error) ? list.error.message : "The outbox could not load."}</FormMessage>
        )
      ) : (
        <>
          <section aria-labelledby="outbox-list-title" className="flex flex-col gap-2">
            <div className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1">
              <h2 id="outbox-list-title">Messages</h2>
              <div className="flex items-baseline gap-3">
                <p className="figures text-sm text-ink-muted" aria-live="polite">
                  {outboxCountLine(messages, list.data.total)}
                  {newest && ` · latest ${formatDateTime(newest.storedAt)}`}
                  {list.isFetching && " · reading…"}
                </p>
                <Button
                  variant="secondary"
                  size="sm"
                  onClick={() => void queryClient.invalidateQueries({ queryKey: outboxKeys.list() })}
                >
                  Look again
                </Button>
              </div>
            </div>
            <p className="text-xs text-ink-muted">
              Kept as .eml files in <code className="break-all">{list.data.folder}</code>
            </p>
            <OutboxListTable messages={messages} {...opening} />
          </section>
          {selectedId !== undefined &&
            (message.data ? (
              <OutboxMessageView key={message.data.id} message={message.data} folder={list.data.folder} />
            ) : message.isError ? (
              <FormMessage>
                {isApiError(message.error) ? message.error.message : "The message could not be read."}
              </FormMessage>
            ) : (
              <p className="text-sm text-ink-muted">Opening the message…</p>
            ))}
        </>
      )}
    </section>
  );
}
