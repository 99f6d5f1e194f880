import { everyRound } from "../../kit/rounds";
import { deliverPendingFilings } from "./filings.service";

/**
 * Sends the filings that wait for the mail server, every `everyMs` (the server process and
 * `npm start` run it); each round first settles deliveries a stop left half-done, from the mail
 * journal, without sending them again. Each round is bounded by the mailer's timeouts; rounds never overlap.
 */
export function startFilingDelivery(everyMs = 30_000): () => void {
  return everyRound(
    everyMs,
    () => deliverPendingFilings(),
    (n) =>
      n.sent || n.refused || n.reconciled
        ? `filing delivery: ${n.reconciled} settled from the mail journal, ${n.sent} delivered, ${n.refused} withdrawn, ${n.pending} still waiting`
        : null,
    "filing delivery failed",
  );
}
