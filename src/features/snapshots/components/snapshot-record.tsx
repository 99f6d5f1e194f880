import type { Snapshot } from "@shared/schemas/snapshot";
import { ServerCheck } from "@/components/ui/check-verdict";
import { Hash } from "@/components/ui/hash";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { formatDateTime } from "@/lib/format";
import { snapshotQueries } from "../api/snapshot-queries";
import { snapshotEventLabels } from "../words";
import { Subsection } from "@/components/ui/page-title";

/** Asks the server to check the snapshot's hash chain again; shows what it found, in its words. */
function VerifyHash({ snapshot }: { snapshot: Snapshot }) {
  return (
    <div className="flex flex-col gap-2">
      <ServerCheck
        query={snapshotQueries.verify(snapshot.id)}
        ask="Verify the hash"
        askAgain="Verify again"
        about="Recomputes the hash from the stored figures and the previous quarter's hash."
        label="Hash check"
        validText="Valid: the figures are as signed off."
        invalidText="Invalid: the stored snapshot does not match its hash."
        unreachableText="The hash could not be checked."
      />
    </div>
  );
}

/** Where the figures came from and the chain that seals them: inputs, engine, hash, previous hash. */
export function SnapshotRecord({ snapshot }: { snapshot: Snapshot }) {
  return (
    <Subsection titleId="record-title" title="Seal and provenance">
      <dl className="grid grid-cols-[max-content_1fr] gap-x-4 gap-y-1 text-sm">
        <dt className="text-ink-muted">Inputs SHA-256</dt>
        <dd>
          <Hash value={snapshot.inputsSha256} empty="—" />
        </dd>
        <dt className="text-ink-muted">Engine version</dt>
        <dd className="figures">{snapshot.engineVersion}</dd>
        <dt className="text-ink-muted">Hash</dt>
        <dd data-testid="snapshot-hash">
          <Hash value={snapshot.hash} empty="Set when the chief risk officer approves it" />
        </dd>
        <dt className="text-ink-muted">Previous hash</dt>
        <dd>
          <Hash
            value={snapshot.prevHash}
            empty={snapshot.hash ? "None: the first signed-off quarter of the entity" : "—"}
          />
        </dd>
      </dl>
      {snapshot.hash && <VerifyHash key={snapshot.id} snapshot={snapshot} />}
    </Subsection>
  );
}

/** Who did what to the snapshot and when, oldest first, with their comments. */
export function SnapshotHistory({ snapshot }: { snapshot: Snapshot }) {
  const events = [...snapshot.history].sort((a, b) => a.at.localeCompare(b.at));
  return (
    <Subsection titleId="history-title" title="History" className="flex flex-col gap-2">
      {events.length === 0 ? (
        <EmptyState title="Nothing recorded yet" />
      ) : (
        <Table caption="History of the snapshot">
          <TableHead columns={["When", "Who", "What", "Comment"]} />
          <tbody>
            {events.map((e, i) => (
              <Tr key={`${e.at}-${i}`}>
                <Td className="figures whitespace-nowrap">{formatDateTime(e.at)}</Td>
                <Td>{e.by}</Td>
                <Td className="whitespace-nowrap">{snapshotEventLabels[e.action]}</Td>
                <Td className="max-w-lg whitespace-pre-wrap">
                  {e.comment ?? <span className="text-ink-faint">—</span>}
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
    </Subsection>
  );
}
