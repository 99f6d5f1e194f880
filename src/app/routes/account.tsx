import { useSuspenseQuery } from "@tanstack/react-query";
import { authQueries } from "@/features/auth/api/auth-queries";
import { ChangePasswordForm } from "@/features/auth/components/change-password-form";
import { NotificationChoicesForm } from "@/features/notifications/components/notification-choices-form";
import { PageTitle } from "@/components/ui/page-title";
import { roleLabels } from "@/lib/role-labels";

export default function AccountRoute() {
  const { data: me } = useSuspenseQuery(authQueries.me());
  if (!me) return null;
  return (
    <div className="flex flex-col gap-6">
      <PageTitle>Your account</PageTitle>
      <section aria-labelledby="account-title" className="flex flex-col gap-1">
        <h1 id="account-title">Your account</h1>
        <p className="text-sm text-ink-muted">
          {me.name} · {me.email} · {roleLabels[me.role]}. Only you know your password; administrators cannot see or set
          it. Changing it ends your sessions on every other device.
        </p>
      </section>
      <section className="border-t border-rule pt-5">
        <ChangePasswordForm user={me} />
      </section>
      <section className="border-t border-rule pt-5">
        <NotificationChoicesForm />
      </section>
    </div>
  );
}
