import type { ReactNode } from "react";
import { FormMessage } from "@/components/ui/field";
import { errorMessage } from "@/lib/api-client";

/**
 * What a screen shows of one read (`what`: "the settings"): why it failed, a line while it is
 * read, then `children` once its data is there.
 */
export function Loaded({
  query,
  what,
  children,
}: {
  query: { data?: unknown; error: unknown };
  what: string;
  children: ReactNode;
}) {
  if (query.error)
    return <FormMessage>{errorMessage(query.error, `${capitalised(what)} could not be read.`)}</FormMessage>;
  if (!query.data) return <p className="text-sm text-ink-muted">{`Reading ${what}…`}</p>;
  return children;
}

function capitalised(text: string) {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
