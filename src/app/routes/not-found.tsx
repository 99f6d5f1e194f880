import { Link, useLocation } from "react-router-dom";
import { paths } from "@/config/paths";
import { PageTitle } from "@/components/ui/page-title";

export default function NotFoundRoute() {
  const { pathname } = useLocation();
  return (
    <section aria-labelledby="not-found-title" className="max-w-xl py-8">
      <PageTitle>Not found</PageTitle>
      <h1 id="not-found-title">No page at this address</h1>
      <p className="mt-2 text-sm text-ink-soft">
        Quartermark has nothing at <code className="figures">{pathname}</code>. The link may be old or mistyped.
      </p>
      <p className="mt-4 text-sm">
        <Link to={paths.overview.href()}>Go to the overview</Link>
      </p>
    </section>
  );
}
