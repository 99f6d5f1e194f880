import { Fragment, useState } from "react";
import { needsSecondAdmin, type RoleRequest, type User } from "@shared/schemas/user";
import type { Role } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { errorMessage } from "@/lib/api-client";
import { formatDateTime } from "@/lib/format";
import { roleIds, roleLabels } from "@/lib/role-labels";
import { cn } from "@/lib/cn";
import {
  staleUserMessage,
  useProposeRole,
  useSendPasswordLink,
  useUnlockUser,
  useUpdateUser,
} from "../api/user-queries";
import { Confirmation } from "@/components/ui/confirmation";
import { OpenedRow } from "@/components/ui/row-actions";

type Pending =
  | { userId: number; kind: "role"; role: Role }
  | { userId: number; kind: "link" }
  | { userId: number; kind: "disable" }
  | { userId: number; kind: "unlock" };

function errorText(error: unknown): string | undefined {
  return staleUserMessage(error) ?? errorMessage(error, "The change could not be saved.");
}

/** What a role change will do, said before it is done. */
function roleConsequence(u: User, role: Role): string {
  if (needsSecondAdmin(u.role, role))
    return `Propose making ${u.name} ${roleLabels[role]}? Nothing changes until another administrator approves; until then ${u.name} stays ${roleLabels[u.role]}. Once approved, their open sessions end.`;
  const tokens = u.role === "treasury" ? " Their API tokens are revoked and do not come back." : "";
  return `Make ${u.name} ${roleLabels[role]}? Their open sessions end at once.${tokens}`;
}

export function UsersTable({
  users,
  currentUserId,
  roleRequests = [],
}: {
  users: User[];
  currentUserId?: number;
  roleRequests?: RoleRequest[];
}) {
  const update = useUpdateUser();
  const propose = useProposeRole();
  const sendLink = useSendPasswordLink();
  const unlock = useUnlockUser();
  const [pending, setPending] = useState<Pending | null>(null);
  const [notice, setNotice] = useState<string>();

  if (users.length === 0) {
    return (
      <EmptyState title="No users yet">
        Invite the first user with the form on this page: give each person the role of their job (analyst, chief risk
        officer, treasury, regulator or administrator).
      </EmptyState>
    );
  }

  const sorted = [...users].sort((a, b) => Number(a.disabled) - Number(b.disabled) || a.name.localeCompare(b.name));
  const error =
    errorText(update.error) ?? errorText(propose.error) ?? errorText(sendLink.error) ?? errorText(unlock.error);
  const busy = update.isPending || propose.isPending || sendLink.isPending || unlock.isPending;
  const waitingFor = new Map(roleRequests.filter((r) => r.userId !== null).map((r) => [r.userId!, r]));

  function resetAll() {
    setNotice(undefined);
    update.reset();
    propose.reset();
    sendLink.reset();
    unlock.reset();
  }

  type Step = "link" | "disable" | "unlock";
  const isOpen = (u: User, kind: Step) => pending?.userId === u.id && pending.kind === kind;
  /** Opens the confirmation of one step on one user, or closes it when it is open already. */
  function toggle(u: User, kind: Step) {
    resetAll();
    setPending(isOpen(u, kind) ? null : { userId: u.id, kind });
  }

  function confirmUnlock(u: User) {
    resetAll();
    unlock.mutate(u.id, {
      onSuccess: () => setNotice(`${u.name} is unlocked and can sign in again now.`),
      onSettled: () => setPending(null),
    });
  }

  function change(user: User, body: { role?: Role; disabled?: boolean }, message: string) {
    resetAll();
    // The version shown: if someone else changed this user meanwhile, the server refuses with 409 stale.
    update.mutate(
      { id: user.id, body: { ...body, version: user.version } },
      {
        onSuccess: () => setNotice(message),
        onSettled: () => setPending(null),
      },
    );
  }

  function confirmRole(u: User, role: Role) {
    if (!needsSecondAdmin(u.role, role)) {
      return change(u, { role }, `${u.name} is now ${roleLabels[role]}. Their open sessions have ended.`);
    }
    resetAll();
    propose.mutate(
      { userId: u.id, role, version: u.version },
      {
        onSuccess: () =>
          setNotice(
            `Proposed: ${u.name} as ${roleLabels[role]}. Another administrator approves or rejects it under “Role changes waiting for approval”.`,
          ),
        onSettled: () => setPending(null),
      },
    );
  }

  function confirmLink(u: User) {
    resetAll();
    sendLink.mutate(
      { id: u.id, body: { version: u.version } },
      {
        onSuccess: ({ invitation }) =>
          setNotice(
            invitation.purpose === "invite"
              ? `A new invitation went to ${u.email}; the earlier link no longer works.`
              : `A link to set a new password went to ${u.email} (valid until ${formatDateTime(invitation.expiresAt)}). Their current password works until they use it.`,
          ),
        onSettled: () => setPending(null),
      },
    );
  }

  return (
    <div className="flex flex-col gap-2">
      <FormMessage>{error}</FormMessage>
      <FormMessage tone="done">{notice}</FormMessage>
      <Table caption="Users">
        <TableHead
          columns={["Name", "E-mail", "Role", "Status", { numeric: "Last sign-in" }, { actions: "Actions" }]}
        />
        <tbody>
          {sorted.map((u) => {
            const self = u.id === currentUserId;
            const waiting = waitingFor.get(u.id);
            const shownRole = pending?.userId === u.id && pending.kind === "role" ? pending.role : u.role;
            return (
              <Fragment key={u.id}>
                <Tr className={cn(u.disabled && "text-ink-muted")}>
                  <Td className="font-medium">
                    {u.name}
                    {self && <span className="ml-1 text-xs font-normal text-ink-muted">(you)</span>}
                  </Td>
                  <Td>{u.email}</Td>
                  <Td>
                    <label className="sr-only" htmlFor={`role-${u.id}`}>
                      Role of {u.name}
                    </label>
                    <select
                      id={`role-${u.id}`}
                      value={shownRole}
                      disabled={busy || self || waiting !== undefined}
                      onChange={(e) => {
                        resetAll();
                        const role = e.target.value as Role;
                        setPending(role === u.role ? null : { userId: u.id, kind: "role", role });
                      }}
                      className="h-7 rounded-sm border border-rule-strong bg-paper-raised px-1.5 text-sm disabled:opacity-70"
                    >
                      {roleIds.map((r) => (
                        <option key={r} value={r}>
                          {roleLabels[r]}
                        </option>
                      ))}
                    </select>
                    {waiting && (
                      <span className="ml-2 text-xs text-ink-muted">
                        → {roleLabels[waiting.toRole]}, awaiting approval
                      </span>
                    )}
                  </Td>
                  <Td>
                    {u.disabled ? "Disabled" : u.passwordSet ? "Active" : "Invited"}
                    {u.lockedUntil && (
                      <span className="block text-xs font-medium text-danger">
                        Locked out until {formatDateTime(u.lockedUntil)}
                      </span>
                    )}
                  </Td>
                  <Td numeric className="whitespace-nowrap">
                    {u.lastSignInAt ? formatDateTime(u.lastSignInAt) : "Never"}
                  </Td>
                  <Td className="text-right whitespace-nowrap">
                    <div className="flex justify-end gap-3">
                      {u.lockedUntil && (
                        <Button
                          variant="quiet"
                          size="sm"
                          disabled={busy}
                          aria-label={`Unlock ${u.name}`}
                          aria-expanded={isOpen(u, "unlock")}
                          onClick={() => toggle(u, "unlock")}
                        >
                          Unlock
                        </Button>
                      )}
                      {!u.disabled && (
                        <Button
                          variant="quiet"
                          size="sm"
                          disabled={busy}
                          aria-label={`${u.passwordSet ? "Send reset link to" : "Invite again:"} ${u.name}`}
                          aria-expanded={isOpen(u, "link")}
                          onClick={() => toggle(u, "link")}
                        >
                          {u.passwordSet ? "Send reset link" : "Invite again"}
                        </Button>
                      )}
                      {!self && (
                        <Button
                          variant="quiet"
                          size="sm"
                          disabled={busy}
                          aria-label={`${u.disabled ? "Enable" : "Disable"} ${u.name}`}
                          aria-expanded={u.disabled ? undefined : isOpen(u, "disable")}
                          onClick={() => {
                            if (u.disabled) return change(u, { disabled: false }, `${u.name} can sign in again.`);
                            // Disabling ends the person's sessions at once: it asks first, saying so.
                            toggle(u, "disable");
                          }}
                        >
                          {u.disabled ? "Enable" : "Disable"}
                        </Button>
                      )}
                    </div>
                  </Td>
                </Tr>
                {pending?.userId === u.id && (
                  <OpenedRow colSpan={6}>
                    {pending.kind === "role" ? (
                      <Confirmation
                        label={`Change the role of ${u.name}`}
                        text={roleConsequence(u, pending.role)}
                        confirm={needsSecondAdmin(u.role, pending.role) ? "Propose change" : "Change role"}
                        busy={busy}
                        onConfirm={() => confirmRole(u, pending.role)}
                        onCancel={() => setPending(null)}
                      />
                    ) : pending.kind === "unlock" ? (
                      <Confirmation
                        label={`Unlock ${u.name}`}
                        text={`Unlock ${u.name}? Their failed sign-ins are forgotten and they can try again at once. Do it only once you know the attempts were theirs; the limit per address stays in force.`}
                        confirm="Unlock the account"
                        busy={busy}
                        onConfirm={() => confirmUnlock(u)}
                        onCancel={() => setPending(null)}
                      />
                    ) : pending.kind === "disable" ? (
                      <Confirmation
                        label={`Disable ${u.name}`}
                        text={`Disable ${u.name}? They can no longer sign in, their open sessions end at once${
                          u.role === "treasury" ? " and their API tokens are revoked for good" : ""
                        }. An administrator can enable them again later.`}
                        confirm="Disable the account"
                        danger
                        busy={busy}
                        onConfirm={() =>
                          change(u, { disabled: true }, `${u.name} can no longer sign in; open sessions have ended.`)
                        }
                        onCancel={() => setPending(null)}
                      />
                    ) : (
                      <Confirmation
                        label={`Send a link to ${u.name}`}
                        text={
                          u.passwordSet
                            ? `Send ${u.name} a link to set a new password? It goes to ${u.email}; their current password keeps working until they use it, and any earlier link stops working.`
                            : `Send ${u.name} a new invitation? It goes to ${u.email}; the earlier link stops working.`
                        }
                        confirm="Send link"
                        busy={busy}
                        onConfirm={() => confirmLink(u)}
                        onCancel={() => setPending(null)}
                      />
                    )}
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
