import { Fragment, useState } from "react";
import type { User } from "@shared/schemas/user";
import type { Role } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { EmptyState, Table, Td, Th, Tr } from "@/components/ui/table";
import { isApiError } from "@/lib/api-client";
import { formatDateTime } from "@/lib/format";
import { roleIds, roleLabels } from "@/lib/role-labels";
import { cn } from "@/lib/cn";
import { staleUserMessage, useUpdateUser } from "../api/user-queries";
import { ResetPasswordForm } from "./reset-password-form";

export function UsersTable({ users, currentUserId }: { users: User[]; currentUserId?: number }) {
  const update = useUpdateUser();
  const [resetFor, setResetFor] = useState<number | null>(null);
  const [notice, setNotice] = useState<string>();

  if (users.length === 0) {
    return (
      <EmptyState title="No users yet">
        Add the first user with the form on this page: give each person the role of their job (analyst, chief risk
        officer, treasury, regulator or administrator).
      </EmptyState>
    );
  }

  const sorted = [...users].sort((a, b) => Number(a.disabled) - Number(b.disabled) || a.name.localeCompare(b.name));
  const error =
    staleUserMessage(update.error) ??
    (isApiError(update.error) ? update.error.message : update.error ? "The change could not be saved." : undefined);

  function change(user: User, body: { role?: Role; disabled?: boolean }, message: string) {
    setNotice(undefined);
    // The version shown: if someone else changed this user meanwhile, the server refuses with 409 stale.
    update.mutate({ id: user.id, body: { ...body, version: user.version } }, { onSuccess: () => setNotice(message) });
  }

  return (
    <div className="flex flex-col gap-2">
      <FormMessage>{error}</FormMessage>
      <FormMessage tone="done">{notice}</FormMessage>
      <Table caption="Users">
        <thead>
          <tr>
            <Th>Name</Th>
            <Th>E-mail</Th>
            <Th>Role</Th>
            <Th>Status</Th>
            <Th numeric>Last sign-in</Th>
            <Th>
              <span className="sr-only">Actions</span>
            </Th>
          </tr>
        </thead>
        <tbody>
          {sorted.map((u) => {
            const self = u.id === currentUserId;
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
                      value={u.role}
                      disabled={update.isPending || self}
                      onChange={(e) => {
                        const role = e.target.value as Role;
                        change(u, { role }, `${u.name} is now ${roleLabels[role]}. Their open sessions have ended.`);
                      }}
                      className="h-7 rounded-sm border border-rule-strong bg-paper-raised px-1.5 text-sm disabled:opacity-70"
                    >
                      {roleIds.map((r) => (
                        <option key={r} value={r}>
                          {roleLabels[r]}
                        </option>
                      ))}
                    </select>
                  </Td>
                  <Td>{u.disabled ? "Disabled" : "Active"}</Td>
                  <Td numeric className="whitespace-nowrap">
                    {u.lastSignInAt ? formatDateTime(u.lastSignInAt) : "Never"}
                  </Td>
                  <Td className="text-right whitespace-nowrap">
                    <div className="flex justify-end gap-3">
                      <Button
                        variant="quiet"
                        size="sm"
                        aria-label={`Reset password of ${u.name}`}
                        onClick={() => setResetFor(resetFor === u.id ? null : u.id)}
                        aria-expanded={resetFor === u.id}
                      >
                        Reset password
                      </Button>
                      {!self && (
                        <Button
                          variant="quiet"
                          size="sm"
                          disabled={update.isPending}
                          aria-label={`${u.disabled ? "Enable" : "Disable"} ${u.name}`}
                          onClick={() =>
                            change(
                              u,
                              { disabled: !u.disabled },
                              u.disabled
                                ? `${u.name} can sign in again.`
                                : `${u.name} can no longer sign in; open sessions have ended.`,
                            )
                          }
                        >
                          {u.disabled ? "Enable" : "Disable"}
                        </Button>
                      )}
                    </div>
                  </Td>
                </Tr>
                {resetFor === u.id && (
                  <tr>
                    <td colSpan={6} className="border-b border-rule bg-paper-sunk/50 px-2 py-2">
                      <ResetPasswordForm
                        user={u}
                        onClose={(message) => {
                          setResetFor(null);
                          if (message) setNotice(message);
                        }}
                      />
                    </td>
                  </tr>
                )}
              </Fragment>
            );
          })}
        </tbody>
      </Table>
    </div>
  );
}
