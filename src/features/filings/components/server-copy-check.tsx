import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import type { Filing } from "@shared/schemas/filing";
import { Button } from "@/components/ui/button";
import { CheckVerdict } from "@/components/ui/check-verdict";
import { filingQueries } from "../api/filing-queries";

/** Asks the server to hash the pack it kept and check the snapshot behind it; shows what it found, in its words. */
export function ServerCopyCheck({ filing }: { filing: Filing }) {
  const [asked, setAsked] = useState(false);
  const verify = useQuery({ ...filingQueries.verify(filing.id), enabled: asked });
  const result = verify.data;
  return (
    <div className="flex flex-col gap-2">
      <h4 className="text-xs font-semibold tracking-wide text-ink-muted uppercase">The server's copy</h4>
      <div className="flex flex-wrap items-center gap-3">
        <Button
          variant="secondary"
          size="sm"
          disabled={verify.isFetching}
          onClick={() => (asked ? void verify.refetch() : setAsked(true))}
        >
          {verify.isFetching ? "Checking…" : result ? "Check again" : "Check the server's copy"}
        </Button>
        <span className="text-xs text-ink-muted">
          Hashes the pack kept at filing and checks the seal of the quarter it came from.
        </span>
      </div>
      <CheckVerdict
        check={verify}
        label="Server copy check"
        validText="Valid: the kept pack is the file that was sent."
        invalidText="Invalid: the kept pack or its quarter does not check out."
        unreachableText="The server's copy could not be checked."
      />
    </div>
  );
}
