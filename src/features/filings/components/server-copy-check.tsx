import type { Filing } from "@shared/schemas/filing";
import { ServerCheck } from "@/components/ui/check-verdict";
import { filingQueries } from "../api/filing-queries";

/** Asks the server to hash the pack it kept and check the snapshot behind it; shows what it found, in its words. */
export function ServerCopyCheck({ filing }: { filing: Filing }) {
  return (
    <div className="flex flex-col gap-2">
      <h4 className="text-xs font-semibold tracking-wide text-ink-muted uppercase">The server's copy</h4>
      <ServerCheck
        query={filingQueries.verify(filing.id)}
        ask="Check the server's copy"
        askAgain="Check again"
        about="Hashes the pack kept at filing and checks the seal of the quarter it came from."
        wrap
        label="Server copy check"
        validText="Valid: the kept pack is the file that was sent."
        invalidText="Invalid: the kept pack or its quarter does not check out."
        unreachableText="The server's copy could not be checked."
      />
    </div>
  );
}
