import type { Filing } from "@shared/schemas/filing";
import type { Role } from "@shared/schemas/common";
import { quarterLabel } from "@shared/backtest/quarters";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import { isApiError } from "@/lib/api-client";
import { formatDateTime } from "@/lib/format";
import { useAcknowledgeFiling } from "../api/filing-queries";

/** Whether the supervisor confirmed receipt; the regulator is offered the confirmation while it is missing. */
export function AcknowledgeReceipt({ filing, role }: { filing: Filing; role: Role }) {
  const acknowledge = useAcknowledgeFiling(filing.id);
  const quarter = quarterLabel(filing.quarterEnd);
  return (
    <div className="flex flex-col gap-2">
      <h4 className="text-xs font-semibold tracking-wide text-ink-muted uppercase">Receipt</h4>
      {acknowledge.isSuccess && (
        <FormMessage tone="done">
          You acknowledged receipt of {filing.entity}'s pack for {quarter}.
        </FormMessage>
      )}
      {acknowledge.error && (
        <FormMessage>
          {isApiError(acknowledge.error)
            ? acknowledge.error.message
            : "The acknowledgement could not be recorded; try again."}
        </FormMessage>
      )}
      {filing.acknowledgedAt ? (
        <p className="text-sm" data-testid="filing-acknowledged">
          Acknowledged by <span className="font-medium">{filing.acknowledgedBy ?? "—"}</span> on{" "}
          <span className="figures">{formatDateTime(filing.acknowledgedAt)}</span>.
        </p>
      ) : role === "regulator" ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button disabled={acknowledge.isPending} onClick={() => acknowledge.mutate()}>
            {acknowledge.isPending ? "Acknowledging…" : "Acknowledge receipt"}
          </Button>
          <span className="text-xs text-ink-muted">
            Confirms to the bank that you received this pack; your name and the time are recorded.
          </span>
        </div>
      ) : (
        <p className="text-sm text-ink-soft" data-testid="filing-acknowledged">
          Not acknowledged yet: the supervisor confirms receipt here once they have the pack.
        </p>
      )}
    </div>
  );
}
