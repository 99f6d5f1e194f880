import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { authQueries } from "@/features/auth/api/auth-queries";
import { userQueries } from "@/features/admin/api/user-queries";
import { CreateUserForm } from "@/features/admin/components/create-user-form";
import { PendingInvitationsTable } from "@/features/admin/components/pending-invitations-table";
import { RoleRequestsTable } from "@/features/admin/components/role-requests-table";
import { UsersTable } from "@/features/admin/components/users-table";
import { CountedHeading, PageTitle } from "@/components/ui/page-title";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await Promise.all([
    queryClient.ensureQueryData(userQueries.all()),
    queryClient.ensureQueryData(userQueries.invitations()),
    queryClient.ensureQueryData(userQueries.roleRequests()),
  ]);
  return null;
};

export default function UsersRoute() {
  const { data: me } = useSuspenseQuery(authQueries.me());
  const { data: users } = useSuspenseQuery(userQueries.all());
  const { data: invitations } = useSuspenseQuery(userQueries.invitations());
  const { data: roleRequests } = useSuspenseQuery(userQueries.roleRequests());
  const active = users.filter((u) => !u.disabled).length;
  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="users-title" className="flex flex-col gap-3">
        <PageTitle>Users</PageTitle>
        <CountedHeading id="users-title" count={`${active} active of ${users.length}`}>
          Users
        </CountedHeading>
        <p className="text-sm text-ink-muted">
          Changing a role or disabling a user ends that person's open sessions at once. Granting or removing the chief
          risk officer or administrator role needs a second administrator's approval. Nobody but the person knows their
          password: send a link instead.
        </p>
        <UsersTable users={users} currentUserId={me?.id} roleRequests={roleRequests} />
      </section>
      <section aria-labelledby="role-requests-title" className="flex flex-col gap-3 border-t border-rule pt-5">
        <h2 id="role-requests-title">Role changes waiting for approval</h2>
        <RoleRequestsTable requests={roleRequests} currentUserId={me?.id} />
      </section>
      <section aria-labelledby="invitations-title" className="flex flex-col gap-3 border-t border-rule pt-5">
        <h2 id="invitations-title">Invitations and reset links not used yet</h2>
        <PendingInvitationsTable invitations={invitations} />
      </section>
      <section className="max-w-2xl border-t border-rule pt-5">
        <CreateUserForm />
      </section>
    </div>
  );
}
