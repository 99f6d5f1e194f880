import { useState, type FormEvent } from "react";
import { useQuery } from "@tanstack/react-query";
import type { NotificationKind } from "@shared/schemas/notification";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { focusWhenShown } from "@/lib/focus";
import { notificationQueries, useSetNotificationChoices } from "../api/notification-queries";

/** The e-mails the person chooses to receive, of those for their role; nothing is sent unless chosen. */
export function NotificationChoicesForm() {
  const { data, error } = useQuery(notificationQueries.choices());
  const save = useSetNotificationChoices();
  const [edited, setEdited] = useState<Set<NotificationKind> | null>(null);
  const [outcome, setOutcome] = useState<string>();
  if (error)
    return <FormMessage>{isApiError(error) ? error.message : "Your e-mail choices could not be read."}</FormMessage>;
  if (!data) return <p className="text-sm text-ink-muted">Reading your e-mail choices…</p>;
  const chosen = edited ?? new Set(data.choices.filter((c) => c.on).map((c) => c.kind));

  async function submit(e: FormEvent) {
    e.preventDefault();
    setOutcome(undefined);
    try {
      const saved = await save.mutateAsync([...chosen]);
      setEdited(null);
      const n = saved.choices.filter((c) => c.on).length;
      setOutcome(
        n === 0 ? "Saved: you receive no e-mails." : `Saved: you receive ${n} kind${n === 1 ? "" : "s"} of e-mail.`,
      );
    } catch (err) {
      setOutcome(isApiError(err) ? err.message : "Your choices could not be saved. Try again.");
    }
  }

  return (
    <form onSubmit={submit} aria-labelledby="notifications-title" className="flex flex-col gap-3">
      <h2 id="notifications-title">E-mails you receive</h2>
      <fieldset className="flex flex-col gap-2">
        <legend className="mb-1 text-sm text-ink-muted">
          Quartermark e-mails you only what you choose here, at your address, after the work has been saved.
        </legend>
        {data.choices.map((c) => (
          <label key={c.kind} className="flex items-center gap-2 text-sm">
            <input
              type="checkbox"
              className="size-4 accent-accent"
              checked={chosen.has(c.kind)}
              onChange={(e) => {
                const next = new Set(chosen);
                if (e.target.checked) next.add(c.kind);
                else next.delete(c.kind);
                setEdited(next);
                setOutcome(undefined);
              }}
            />
            {c.label}
          </label>
        ))}
      </fieldset>
      <div className="flex items-center gap-3">
        <Button type="submit" variant="secondary" disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Save e-mail choices"}
        </Button>
        {outcome && (
          <p ref={focusWhenShown} tabIndex={-1} role="status" className="text-sm text-ink-soft">
            {outcome}
          </p>
        )}
      </div>
    </form>
  );
}
