import { Fragment, useState } from "react";
import type { RoleRequest } from "@shared/schemas/user";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { Table, TableHead, Td, Tr } from "@/components/ui/table";
import { errorMessage } from "@/lib/api-client";
import { formatDateTime } from "@/lib/format";
import { roleLabels } from "@/lib/role-labels";
import { useDecideRoleRequest } from "../api/user-queries";
import { Confirmation } from "@/components/ui/confirmation";
import { OpenedRow } from "@/components/ui/row-actions";

type Decision = { id: number; decision: "approve" | "reject" };

function change(r: RoleRequest): string {
  if (r.kind === "invite") return `New user as ${roleLabels[r.toRole]}`;
  return `${roleLabels[r.fromRole!]} → ${roleLabels[r.toRole]}`;
}

function consequence(r: RoleRequest, decision: "approve" | "reject"): string {
  if (decision === "reject")
    return `Reject this request? ${r.name}'s role stays as it is; the proposer can propose again.`;
  if (r.kind === "invite")
    return `Approve? ${r.name} becomes ${roleLabels[r.toRole]}: the account is created and the invitation goes to ${r.email} at once.`;
  return `Approve? ${r.name} becomes ${roleLabels[r.toRole]} at once and their open sessions end.`;
}

/**
 * Grants and removals of the CRO or administrator role that wait for a second administrator. The
 * proposer and the person concerned cannot approve (the server refuses too); the proposer may withdraw.
 */
export function RoleRequestsTable({ requests, currentUserId }: { requests: RoleRequest[]; currentUserId?: number }) {
  const decide = useDecideRoleRequest();
  const [asking, setAsking] = useState<Decision | null>(null);
  const [notice, setNotice] = useState<string>();

  if (requests.length === 0) {
    return (
      <div className="flex flex-col gap-2">
        <FormMessage tone="done">{notice}</FormMessage>
        <p className="text-sm text-ink-muted">No role changes are waiting for approval.</p>
      </div>
    );
  }

  const error = errorMessage(decide.error, "The decision was not saved.");

  return (
    <div className="flex flex-col gap-2">
      <FormMessage>{error}</FormMessage>
      <FormMessage tone="done">{notice}</FormMessage>
      <Table caption="Role changes waiting for approval">
        <TableHead columns={["Person", "Change", "Proposed by", { numeric: "Proposed" }, { actions: "Decision" }]} />
        <tbody>
          {requests.map((r) => {
            const mine = r.proposedBy.id === currentUserId;
            const aboutMe = r.userId !== null && r.userId === currentUserId;
            return (
              <Fragment key={r.id}>
                <Tr data-testid={`role-request-${r.id}`}>
                  <Td className="font-medium">
                    {r.name} <span className="font-normal text-ink-muted">{r.email}</span>
                  </Td>
                  <Td>{change(r)}</Td>
                  <Td>{mine ? `${r.proposedBy.name} (you)` : r.proposedBy.name}</Td>
                  <Td numeric className="whitespace-nowrap">
                    {formatDateTime(r.proposedAt)}
                  </Td>
                  <Td className="text-right whitespace-nowrap">
                    {aboutMe ? (
                      <span className="text-xs text-ink-muted">About your own role: another administrator decides</span>
                    ) : (
                      <div className="flex items-center justify-end gap-3">
                        {mine ? (
                          <span className="text-xs text-ink-muted">Another administrator approves</span>
                        ) : (
                          <Button
                            size="sm"
                            variant="quiet"
                            aria-label={`Approve ${change(r)} for ${r.name}`}
                            disabled={decide.isPending}
                            onClick={() => setAsking({ id: r.id, decision: "approve" })}
                          >
                            Approve
                          </Button>
                        )}
                        <Button
                          size="sm"
                          variant="quiet"
                          aria-label={`${mine ? "Withdraw" : "Reject"} ${change(r)} for ${r.name}`}
                          disabled={decide.isPending}
                          onClick={() => setAsking({ id: r.id, decision: "reject" })}
                        >
                          {mine ? "Withdraw" : "Reject"}
                        </Button>
                      </div>
                    )}
                  </Td>
                </Tr>
                {asking?.id === r.id && (
                  <OpenedRow colSpan={5}>
                    <Confirmation
                      label={`${asking.decision === "approve" ? "Approve" : "Reject"} the request for ${r.name}`}
                      text={consequence(r, asking.decision)}
                      confirm={asking.decision === "approve" ? "Approve change" : "Reject request"}
                      danger={asking.decision === "reject"}
                      busy={decide.isPending}
                      onCancel={() => setAsking(null)}
                      onConfirm={() =>
                        decide.mutate(asking, {
                          onSuccess: (done) =>
                            setNotice(
                              done.status === "approved"
                                ? `Approved: ${done.name} is now ${roleLabels[done.toRole]}${done.kind === "invite" ? "; the invitation went out" : ""}.`
                                : `Rejected: ${done.name}'s role stays as it was.`,
                            ),
                          onSettled: () => setAsking(null),
                        })
                      }
                    />
                  </OpenedRow>
                )}
              </Fragment>
            );
          })}
        </tbody>
      </Table>
    </div>
  );
}
