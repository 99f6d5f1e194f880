import { redirect } from "react-router-dom";
import type { QueryClient } from "@tanstack/react-query";
import type { SessionUser } from "@shared/schemas/auth";
import { paths } from "@/config/paths";
import { authQueries } from "@/features/auth/api/auth-queries";

/** The signed-in user, or a redirect to sign-in that remembers where the reader was going. */
export async function requireUser(queryClient: QueryClient, request: Request): Promise<SessionUser> {
  const user = await queryClient.ensureQueryData(authQueries.me());
  if (!user) {
    const url = new URL(request.url);
    throw redirect(paths.signIn.href(url.pathname + url.search));
  }
  return user;
}
