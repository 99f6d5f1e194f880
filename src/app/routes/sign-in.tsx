import { Link, useNavigate, useSearchParams } from "react-router-dom";
import { useSuspenseQuery, type QueryClient } from "@tanstack/react-query";
import { safeRedirect } from "@/config/paths";
import { roleLabels } from "@/lib/role-labels";
import { authQueries } from "@/features/auth/api/auth-queries";
import { SignInForm } from "@/features/auth/components/sign-in-form";
import { QuartermarkMark } from "@/components/ui/mark";
import { PublicPage } from "../public-page";

// Someone already signed in may stay here to sign in as another person (the demo has one user per role).
export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(authQueries.me());
  return null;
};

const demoUsers = [
  ["admin@larkspur.test", "administrator"],
  ["admin2@larkspur.test", "second administrator"],
  ["analyst@larkspur.test", "analyst"],
  ["analyst2@larkspur.test", "second analyst"],
  ["cro@larkspur.test", "chief risk officer"],
  ["treasury@larkspur.test", "treasury"],
  ["regulator@larkspur.test", "regulator"],
  ["regulator2@larkspur.test", "second regulator"],
] as const;

export default function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const redirectTo = safeRedirect(params.get("redirectTo"));
  const { data: current } = useSuspenseQuery(authQueries.me());

  return (
    <PublicPage title="Sign in">
      <div className="mb-6 flex items-center gap-2.5">
        <QuartermarkMark className="size-7" />
        <div>
          <p className="text-lg leading-tight font-semibold tracking-tight">Quartermark</p>
          <p className="text-xs text-ink-muted">Backtesting, zones and quarter sign-off</p>
        </div>
      </div>
      <div className="border-t border-rule-strong pt-5">
        <h1 id="sign-in-title" className="mb-4 text-base">
          Sign in
        </h1>
        {current ? (
          <p className="mb-4 text-sm text-ink-muted">
            You are signed in as {current.name} ({roleLabels[current.role]}).{" "}
            <Link to={redirectTo}>Continue as {current.name.split(" ")[0]}</Link>, or sign in below as someone else.
          </p>
        ) : (
          redirectTo !== "/" && (
            <p className="mb-4 text-sm text-ink-muted">Sign in to continue to the page you asked for.</p>
          )
        )}
        <SignInForm onSignedIn={() => navigate(redirectTo, { replace: true })} />
      </div>
      <details className="mt-8 border-t border-rule pt-3 text-sm text-ink-soft">
        <summary className="text-xs text-ink-muted">Demo sign-ins</summary>
        <p className="mt-2 text-xs text-ink-muted">
          This build ships with invented demo data for Larkspur Bank. Every demo account uses the demo password printed
          when the server starts (<code>quartermark-demo</code> unless DEMO_PASSWORD is set).
        </p>
        <ul className="figures mt-2 space-y-0.5 text-xs">
          {demoUsers.map(([email, who]) => (
            <li key={email}>
              <code>{email}</code> <span className="text-ink-muted">— {who}</span>
            </li>
          ))}
        </ul>
      </details>
    </PublicPage>
  );
}
