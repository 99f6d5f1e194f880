import { Suspense } from "react";
import {
  Navigate,
  NavLink,
  Outlet,
  useLocation,
  useNavigate,
  useNavigation,
  type LoaderFunctionArgs,
} from "react-router-dom";
import { useQuery, useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import type { SessionUser } from "@shared/schemas/auth";
import { mayOpen, navigation, paths } from "@/config/paths";
import { authQueries, useLogout } from "@/features/auth/api/auth-queries";
import { queueQueries } from "@/features/queue/api/queue-queries";
import { Button } from "@/components/ui/button";
import { QuartermarkMark } from "@/components/ui/mark";
import { roleLabels } from "@/lib/role-labels";
import { cn } from "@/lib/cn";
import { requireUser } from "../require-user";
import { CautionFooter } from "../public-page";

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireUser(queryClient, request);
    return null;
  };

/** "Waiting for me" with the number of items beside it (read again every minute and after each change). */
function WaitingLabel() {
  const { data } = useQuery(queueQueries.list());
  const count = data?.length;
  return (
    <>
      {paths.waiting.label}
      {count !== undefined && count > 0 && (
        <>
          {" "}
          <span className="figures ml-0.5 rounded-full bg-accent px-1.5 py-px text-2xs font-semibold text-paper-raised">
            {count}
          </span>
          <span className="sr-only"> {count === 1 ? "item" : "items"}</span>
        </>
      )}
    </>
  );
}

export function MainNavigation({ user }: { user: SessionUser }) {
  const main = navigation.filter((n) => n.group === "main" && mayOpen(n.key, user.role));
  const admin = navigation.filter((n) => n.group === "admin" && mayOpen(n.key, user.role));
  const link = ({ isActive }: { isActive: boolean }) =>
    cn(
      "block border-b-2 py-2.5 text-sm no-underline! hover:text-ink",
      isActive ? "border-accent font-medium text-ink" : "border-transparent text-ink-soft",
    );
  return (
    <nav aria-label="Main" className="flex items-center gap-6">
      <ul className="flex items-center gap-5">
        {main.map((n) => (
          <li key={n.key}>
            <NavLink to={paths[n.key].path} end={paths[n.key].path === "/"} className={link}>
              {n.key === "waiting" ? <WaitingLabel /> : paths[n.key].label}
            </NavLink>
          </li>
        ))}
      </ul>
      {admin.length > 0 && (
        <div className="flex items-center gap-5 border-l border-rule pl-6">
          <span className="text-2xs font-semibold tracking-wide text-ink-faint uppercase" id="nav-admin-label">
            Administration
          </span>
          <ul className="flex items-center gap-5" aria-labelledby="nav-admin-label">
            {admin.map((n) => (
              <li key={n.key}>
                <NavLink to={paths[n.key].path} className={link}>
                  {paths[n.key].label}
                </NavLink>
              </li>
            ))}
          </ul>
        </div>
      )}
    </nav>
  );
}

function SignOut() {
  const logout = useLogout();
  const navigate = useNavigate();
  return (
    <Button
      variant="quiet"
      size="sm"
      disabled={logout.isPending}
      onClick={() => logout.mutate(undefined, { onSuccess: () => navigate(paths.signIn.href(), { replace: true }) })}
    >
      {logout.isPending ? "Signing out…" : "Sign out"}
    </Button>
  );
}

function PendingBar() {
  const navigation = useNavigation();
  if (navigation.state === "idle") return null;
  return (
    <div
      role="progressbar"
      aria-label="Loading page"
      className="fixed inset-x-0 top-0 z-50 h-0.5 overflow-hidden bg-accent-soft"
    >
      <div className="h-full w-1/3 animate-pulse bg-accent" />
    </div>
  );
}

export default function AppLayout() {
  const { data: user } = useSuspenseQuery(authQueries.me());
  const location = useLocation();
  if (!user) return <Navigate to={paths.signIn.href(location.pathname + location.search)} replace />;

  return (
    <div className="flex min-h-screen flex-col">
      <PendingBar />
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:bg-paper-raised focus:px-2 focus:py-1"
      >
        Skip to content
      </a>
      <header className="border-b border-rule bg-paper-raised print:hidden">
        <div className="mx-auto flex max-w-screen-2xl flex-wrap items-center gap-x-8 px-6">
          <NavLink to={paths.overview.href()} className="flex items-center gap-2 py-2 text-ink! no-underline!">
            <QuartermarkMark className="size-5" />
            <span className="text-base font-semibold tracking-tight">Quartermark</span>
          </NavLink>
          <MainNavigation user={user} />
          <div className="ml-auto flex items-center gap-3 py-2 text-sm">
            <NavLink
              to={paths.account.href()}
              className="text-ink! no-underline! hover:underline!"
              title="Your account"
            >
              <span className="font-medium">{user.name}</span>
              <span className="text-ink-muted"> · {roleLabels[user.role]}</span>
            </NavLink>
            <SignOut />
          </div>
        </div>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-screen-2xl flex-1 px-6 py-6 outline-none">
        <Suspense fallback={<p className="text-sm text-ink-muted">Loading…</p>}>
          <Outlet />
        </Suspense>
      </main>
      <CautionFooter wide />
    </div>
  );
}
