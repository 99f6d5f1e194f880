import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { authQueries } from "@/features/auth/api/auth-queries";
import { userQueries } from "@/features/admin/api/user-queries";
import { CreateUserForm } from "@/features/admin/components/create-user-form";
import { UsersTable } from "@/features/admin/components/users-table";
import { PageTitle } from "@/components/ui/page-title";

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(userQueries.all());
  return null;
};

export default function UsersRoute() {
  const { data: me } = useSuspenseQuery(authQueries.me());
  const { data: users } = useSuspenseQuery(userQueries.all());
  const active = users.filter((u) => !u.disabled).length;
  return (
    <div className="flex flex-col gap-8">
      <section aria-labelledby="users-title" className="flex flex-col gap-3">
        <PageTitle>Users</PageTitle>
        <div className="flex items-baseline justify-between gap-4">
          <h1 id="users-title">Users</h1>
          <p className="figures text-sm text-ink-muted">
            {active} active of {users.length}
          </p>
        </div>
        <p className="text-sm text-ink-muted">
          Changing a role, disabling a user or setting a new password ends that person's open sessions at once.
        </p>
        <UsersTable users={users} currentUserId={me?.id} />
      </section>
      <section className="max-w-2xl border-t border-rule pt-5">
        <CreateUserForm />
      </section>
    </div>
  );
}
