import type { CreatedApiToken } from "@shared/schemas/api-token";
import { Button } from "@/components/ui/button";
import { CopyButton } from "@/components/ui/copy-button";
import { formatDateTime } from "@/lib/format";

/** A shell command a script author can paste as it is: the token in the header, one entity's capital history. */
export function curlExample(origin: string, entityCode: string, secret: string): string {
  return `curl -H "Authorization: Bearer ${secret}" ${origin}/api/entities/${encodeURIComponent(entityCode)}/capital/history`;
}

// Stable, so the focus moves once, when the panel appears, and not on every re-render.
const focusWhenShown = (el: HTMLElement | null) => {
  el?.focus();
};

/**
 * The new token's secret, this once: Quartermark keeps only its SHA-256, so it cannot be shown
 * again. Focus lands on the heading so a keyboard or screen-reader user meets it first.
 */
export function NewTokenSecret({
  token,
  entityCode,
  origin,
  onDone,
}: {
  token: CreatedApiToken;
  entityCode?: string;
  origin: string;
  onDone: () => void;
}) {
  const command = entityCode ? curlExample(origin, entityCode, token.secret) : undefined;
  return (
    <section
      aria-labelledby="new-token-title"
      className="flex flex-col gap-3 border-l-2 border-accent bg-accent-soft px-4 py-3"
      data-testid="new-token"
    >
      <h2 id="new-token-title" tabIndex={-1} ref={focusWhenShown} className="outline-none">
        Copy the token “{token.name}” now
      </h2>
      <p className="text-sm">
        This is the only time it is shown: Quartermark keeps a fingerprint of it, not the token itself. Store it where
        your script reads its secrets (not in the script's code). It works until {formatDateTime(token.expiresAt)}{" "}
        unless you revoke it.
      </p>
      <div className="flex flex-wrap items-start gap-x-2 gap-y-1">
        <code
          className="min-w-0 bg-paper-raised px-2 py-1 font-mono text-sm break-all select-all"
          data-testid="new-token-secret"
        >
          {token.secret}
        </code>
        <CopyButton value={token.secret} what="The token" label="Copy the token" />
      </div>
      {command && (
        <div className="flex flex-col gap-1">
          <p className="text-xs font-medium text-ink-soft">Try it: {entityCode}'s signed-off capital history as JSON</p>
          <div className="flex flex-wrap items-start gap-x-2 gap-y-1">
            <pre
              className="min-w-0 flex-1 bg-paper-raised px-2 py-1 font-mono text-xs break-all whitespace-pre-wrap select-all"
              data-testid="new-token-curl"
            >
              {command}
            </pre>
            <CopyButton value={command} what="The command" label="Copy the command" />
          </div>
        </div>
      )}
      <div>
        <Button variant="secondary" onClick={onDone}>
          I have stored it
        </Button>
      </div>
    </section>
  );
}
