import type { Filing } from "@shared/schemas/filing";
import type { Role } from "@shared/schemas/common";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { FilingPendingNotice, Notice } from "@/components/ui/notice";
import { isApiError } from "@/lib/api-client";
import { formatDateTime } from "@/lib/format";
import { useFinishFiling } from "../api/filing-queries";

type Delivery = Filing["deliveries"][number];

/** A message that replaces the button pressed takes the focus, so it is read out. */
const focusWhenShown = (el: HTMLElement | null) => {
  el?.focus();
};

const STATUS_WORDS: Record<Delivery["status"], string> = {
  accepted: "Received by their mail server",
  refused: "Refused",
  pending: "Waiting for the mail server",
  sending: "Being sent",
  unknown: "Not known: the delivery was cut off",
};

/**
 * Where the filing's message stands for each recipient, and, for the chief risk officer, sending it
 * to those who do not have it yet (never again to a recipient whose mail server took it).
 */
export function FilingDelivery({ filing, role }: { filing: Filing; role: Role }) {
  const finish = useFinishFiling(filing.id);
  const open = filing.deliveries.filter((d) => d.status === "refused" || d.status === "unknown");
  const mayFinish = role === "cro" && open.length > 0;
  return (
    <div className="flex flex-col gap-2" data-testid="filing-delivery">
      {filing.delivery === "partial" && (
        <Notice role="status" testId="filing-partial">
          Partly delivered: {filing.summary}
        </Notice>
      )}
      {filing.delivery === "pending" && <FilingPendingNotice filing={filing} />}
      <table className="text-sm">
        <caption className="sr-only">Delivery to each recipient</caption>
        <thead>
          <tr className="text-left text-2xs tracking-wide text-ink-muted uppercase">
            <th scope="col" className="pr-4 font-semibold">
              Recipient
            </th>
            <th scope="col" className="pr-4 font-semibold">
              Delivery
            </th>
            <th scope="col" className="font-semibold">
              Mail server's answer
            </th>
          </tr>
        </thead>
        <tbody>
          {filing.deliveries.map((d) => (
            <tr key={d.recipient} data-testid="filing-delivery-row" className="align-top">
              <td className="pr-4">{d.recipient}</td>
              <td className="pr-4">
                {STATUS_WORDS[d.status]}
                {d.acceptedAt && (
                  <>
                    {" "}
                    <span className="figures text-ink-muted">{formatDateTime(d.acceptedAt)}</span>
                  </>
                )}
              </td>
              <td className="text-ink-soft">{d.detail ?? "—"}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {mayFinish && (
        <div className="flex flex-col gap-1">
          <div>
            <Button onClick={() => finish.mutate()} disabled={finish.isPending}>
              {finish.isPending ? "Sending…" : `Send to ${open.map((d) => d.recipient).join(", ")}`}
            </Button>
          </div>
          <p className="text-xs text-ink-muted">
            The same message, with the same Message-ID, goes only to{" "}
            {open.length === 1 ? "this recipient" : "these recipients"}; those who received it are not sent it again.
            {open.some((d) => d.status === "unknown") &&
              " A recipient marked not known may already have it: ask them first."}
          </p>
        </div>
      )}
      {finish.isSuccess && (
        <FormMessage tone="done" ref={focusWhenShown}>
          {finish.data.summary}
        </FormMessage>
      )}
      {finish.error && (
        <FormMessage ref={focusWhenShown}>
          {isApiError(finish.error) ? finish.error.message : "The filing could not be sent; try again."}
        </FormMessage>
      )}
    </div>
  );
}
