import { Fragment, useRef, useState } from "react";
import { flushSync } from "react-dom";
import type { ApiToken, ApiTokenStatus } from "@shared/schemas/api-token";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { OpenedRow } from "@/components/ui/row-actions";
import { errorMessage } from "@/lib/api-client";
import { cn } from "@/lib/cn";
import { cancelOnEscape, focusWhenShown } from "@/lib/focus";
import { formatDateTime } from "@/lib/format";
import { useRevokeApiToken } from "../api/api-token-queries";

const statusLabels: Record<ApiTokenStatus, string> = { active: "Active", expired: "Expired", revoked: "Revoked" };

function StatusCell({ token }: { token: ApiToken }) {
  if (token.status === "revoked") return <>Revoked {formatDateTime(token.revokedAt)}</>;
  return <>{statusLabels[token.status]}</>;
}

/** Asks before revoking: scripts that use the token stop at once, and a revoked token cannot be brought back. */
function RevokeConfirmation({ token, onClose }: { token: ApiToken; onClose: (message?: string) => void }) {
  const revoke = useRevokeApiToken();
  const error = errorMessage(revoke.error, "The token could not be revoked; try again.");
  return (
    <div
      role="group"
      aria-label={`Revoke ${token.name}`}
      className="flex flex-col gap-2"
      onKeyDown={cancelOnEscape(() => !revoke.isPending && onClose())}
    >
      <FormMessage>{error}</FormMessage>
      <div className="flex flex-col gap-2 border-l-2 border-danger pl-3">
        <p className="text-sm">
          Scripts using “{token.name}” ({token.prefix}…) are refused from now on. A revoked token cannot be used again.
        </p>
        <div className="flex items-center gap-3">
          <Button
            variant="danger"
            ref={focusWhenShown}
            disabled={revoke.isPending}
            onClick={() =>
              revoke.mutate(token.id, {
                onSuccess: () => onClose(`“${token.name}” is revoked; scripts using it are refused.`),
              })
            }
          >
            {revoke.isPending ? "Revoking…" : "Revoke token"}
          </Button>
          <Button variant="quiet" disabled={revoke.isPending} onClick={() => onClose()}>
            Cancel
          </Button>
        </div>
      </div>
    </div>
  );
}

/** The signed-in person's tokens: what each is called, how to recognise it, when it was last used and how long it lives. */
export function TokensTable({ tokens }: { tokens: ApiToken[] }) {
  const [confirmFor, setConfirmFor] = useState<number | null>(null);
  const [notice, setNotice] = useState<string>();
  const revokeButtons = useRef(new Map<number, HTMLButtonElement>());

  if (tokens.length === 0) {
    return (
      <EmptyState title="No API tokens yet">
        Create one with the form below for each script, so that one can be revoked without stopping the others.
      </EmptyState>
    );
  }

  function close(id: number, message?: string) {
    flushSync(() => setConfirmFor(null));
    if (message) setNotice(message);
    else revokeButtons.current.get(id)?.focus();
  }

  return (
    <div className="flex flex-col gap-2">
      <FormMessage tone="done" ref={focusWhenShown}>
        {notice}
      </FormMessage>
      <Table caption="Your API tokens">
        <TableHead
          columns={[
            "Name",
            "Starts with",
            { numeric: "Created" },
            { numeric: "Last used" },
            { numeric: "Expires" },
            "Status",
            { actions: "Actions" },
          ]}
        />
        <tbody>
          {tokens.map((t) => (
            <Fragment key={t.id}>
              <Tr className={cn(t.status !== "active" && "text-ink-muted")} data-testid={`token-${t.id}`}>
                <Td className="font-medium">{t.name}</Td>
                <Td>
                  <code className="text-xs">{t.prefix}…</code>
                </Td>
                <Td numeric className="whitespace-nowrap">
                  {formatDateTime(t.createdAt)}
                </Td>
                <Td numeric className="whitespace-nowrap">
                  {t.lastUsedAt ? formatDateTime(t.lastUsedAt) : "Never"}
                </Td>
                <Td numeric className="whitespace-nowrap">
                  {formatDateTime(t.expiresAt)}
                </Td>
                <Td className="whitespace-nowrap">
                  <StatusCell token={t} />
                </Td>
                <Td className="text-right whitespace-nowrap">
                  {t.status === "active" && (
                    <Button
                      variant="quiet"
                      size="sm"
                      ref={(el) => {
                        if (el) revokeButtons.current.set(t.id, el);
                        else revokeButtons.current.delete(t.id);
                      }}
                      aria-label={`Revoke ${t.name}`}
                      aria-expanded={confirmFor === t.id}
                      onClick={() => {
                        setNotice(undefined);
                        setConfirmFor(confirmFor === t.id ? null : t.id);
                      }}
                    >
                      Revoke
                    </Button>
                  )}
                </Td>
              </Tr>
              {confirmFor === t.id && (
                <OpenedRow colSpan={7}>
                  <RevokeConfirmation token={t} onClose={(message) => close(t.id, message)} />
                </OpenedRow>
              )}
            </Fragment>
          ))}
        </tbody>
      </Table>
    </div>
  );
}
