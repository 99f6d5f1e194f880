import type { ReactNode } from "react";
import { Link } from "react-router-dom";
import { useSuspenseQuery } from "@tanstack/react-query";
import type { Role } from "@shared/schemas/common";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { roleLabels } from "@/lib/role-labels";

/** Shows the page only to the roles of its path; everyone else learns plainly that it is not for them. */
export function RoleGate({ roles, children }: { roles: readonly Role[]; children: ReactNode }) {
  const { data: user } = useSuspenseQuery(authQueries.me());
  if (user && roles.includes(user.role)) return <>{children}</>;
  return <NotAvailable role={user?.role} />;
}

export function NotAvailable({ role }: { role?: Role }) {
  return (
    <section aria-labelledby="not-available-title" className="max-w-xl py-8">
      <h1 id="not-available-title">Not available for your role</h1>
      <p className="mt-2 text-sm text-ink-soft">
        {role ? `Signed in as ${roleLabels[role]}, you cannot open this page.` : "You cannot open this page."} If your
        work needs it, ask an administrator to review your role.
      </p>
      <p className="mt-4 text-sm">
        <Link to={paths.overview.href()}>Go to the overview</Link>
      </p>
    </section>
  );
}
