import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import type { QueryClient } from "@tanstack/react-query";
import { safeRedirect } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";
import { SignInForm } from "@/features/auth/components/sign-in-form";
import { QuartermarkMark } from "@/components/ui/mark";
import { CAUTION } from "../caution";

export const clientLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const user = await queryClient.ensureQueryData(authQueries.me());
  // Already signed in: go straight on.
  if (user) throw redirect(safeRedirect(new URL(request.url).searchParams.get("redirectTo")));
  return null;
};

const demoUsers = [
  ["admin@larkspur.test", "administrator"],
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

  return (
    <div className="flex min-h-screen flex-col">
      <main className="flex flex-1 items-start justify-center px-6 pt-[12vh]">
        <div className="w-full max-w-sm">
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
            {redirectTo !== "/" && <p className="mb-4 text-sm text-ink-muted">Sign in to continue to the page you asked for.</p>}
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
        </div>
      </main>
      <footer className="border-t border-rule">
        <p className="px-6 py-2 text-2xs text-ink-muted">{CAUTION}</p>
      </footer>
    </div>
  );
}
