import { isRouteErrorResponse, Link, useLocation, useRevalidator, useRouteError } from "react-router-dom";
import { paths } from "@/config/paths";
import { isApiError } from "@/lib/api-client";
import { Button } from "@/components/ui/button";

function describe(error: unknown): { title: string; body: string; signIn?: boolean } {
  if (isRouteErrorResponse(error)) {
    if (error.status === 404)
      return {
        title: "Not found",
        body: typeof error.data === "string" ? error.data : "Nothing exists at this address.",
      };
    return { title: `Error ${error.status}`, body: typeof error.data === "string" ? error.data : error.statusText };
  }
  if (isApiError(error)) {
    if (error.status === 401)
      return { title: "Your session has ended", body: "Sign in again to continue.", signIn: true };
    if (error.status === 403) return { title: "Not available for your role", body: error.message };
    if (error.status === 404) return { title: "Not found", body: error.message };
    if (error.status === 0) return { title: "The server cannot be reached", body: error.message };
    return { title: "This page could not load", body: error.message };
  }
  return {
    title: "Something went wrong on this page",
    body: error instanceof Error ? error.message : "An unexpected error occurred.",
  };
}

/** Per-route error view: says what happened in plain words and offers the next step. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  const location = useLocation();
  const revalidator = useRevalidator();
  const { title, body, signIn } = describe(error);
  return (
    <section role="alert" aria-labelledby="route-error-title" className="max-w-xl py-8">
      <h1 id="route-error-title">{title}</h1>
      <p className="mt-2 text-sm text-ink-soft">{body}</p>
      <div className="mt-4 flex items-center gap-4 text-sm">
        {signIn ? (
          <Link to={paths.signIn.href(location.pathname + location.search)}>Sign in</Link>
        ) : (
          <Button variant="secondary" size="sm" onClick={() => revalidator.revalidate()}>
            Try again
          </Button>
        )}
        <Link to={paths.overview.href()}>Go to the overview</Link>
      </div>
    </section>
  );
}
