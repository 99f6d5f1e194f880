import { Link, useLocation, useNavigate } from "react-router-dom";
import { useQuery } from "@tanstack/react-query";
import { invitationTokenSchema } from "@shared/schemas/auth";
import { paths } from "@/config/paths";
import { invitationQueries } from "@/features/auth/api/auth-queries";
import { SetPasswordForm } from "@/features/auth/components/set-password-form";
import { QuartermarkMark } from "@/components/ui/mark";
import { FormMessage } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { formatDateTime } from "@/lib/format";
import { roleLabels } from "@/lib/role-labels";
import { PublicPage } from "../public-page";

/** The token of the link: after `#`, where the browser never sends it to a server. */
function tokenOf(hash: string): string | null {
  const token = hash.replace(/^#/, "");
  return invitationTokenSchema.safeParse(token).success ? token : null;
}

function Shell({ children }: { children: React.ReactNode }) {
  return (
    <PublicPage title="Set your password">
      <div className="mb-6 flex items-center gap-2.5">
        <QuartermarkMark className="size-7" />
        <p className="text-lg leading-tight font-semibold tracking-tight">Quartermark</p>
      </div>
      <div className="border-t border-rule-strong pt-5">{children}</div>
    </PublicPage>
  );
}

function LinkProblem({ message }: { message: string }) {
  return (
    <>
      <h1 id="set-password-title" className="mb-3 text-base">
        This link cannot be used
      </h1>
      <FormMessage>{message}</FormMessage>
      <p className="mt-4 text-sm">
        Already have a password? <Link to={paths.signIn.href()}>Sign in</Link>.
      </p>
    </>
  );
}

export default function SetPasswordRoute() {
  const { hash } = useLocation();
  const navigate = useNavigate();
  const token = tokenOf(hash);
  const lookup = useQuery({ ...invitationQueries.one(token ?? ""), enabled: token !== null });

  if (!token)
    return (
      <Shell>
        <LinkProblem message="This link is not complete. Open it again from the e-mail, or copy all of it into the address bar." />
      </Shell>
    );
  if (lookup.isPending) {
    return (
      <Shell>
        <p className="text-sm text-ink-muted">Checking your link…</p>
      </Shell>
    );
  }
  if (lookup.isError) {
    const message = isApiError(lookup.error)
      ? lookup.error.message
      : "The link could not be checked. Try again in a moment.";
    return (
      <Shell>
        <LinkProblem message={message} />
      </Shell>
    );
  }
  const invitation = lookup.data;
  return (
    <Shell>
      <h1 id="set-password-title" className="mb-2 text-base">
        {invitation.purpose === "invite" ? `Welcome, ${invitation.name}` : `A new password for ${invitation.name}`}
      </h1>
      <p className="mb-4 text-sm text-ink-muted">
        {invitation.purpose === "invite"
          ? `Your Quartermark account (${roleLabels[invitation.role]}) is ready. Choose your password: only you will know it.`
          : "Choose a new password. Your current one stops working once you save; other sessions end."}{" "}
        This link works once, until {formatDateTime(invitation.expiresAt)}.
      </p>
      <SetPasswordForm token={token} invitation={invitation} onDone={() => navigate("/", { replace: true })} />
    </Shell>
  );
}
