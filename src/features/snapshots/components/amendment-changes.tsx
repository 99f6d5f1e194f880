import { Link } from "react-router-dom";
import type { AmendmentChange, AmendmentRecord } from "@shared/schemas/snapshot";
import { Figure } from "@/components/ui/figure";
import { FullHash } from "@/components/ui/hash";
import { Table, TableHead, Td } from "@/components/ui/table";
import { zoneName } from "@/components/ui/zone-badge";
import { formatAmount, formatDateTime, formatFactor } from "@/lib/format";
import { Subsection } from "@/components/ui/page-title";

/** A before or after value as the table shows it: amounts in the entity's currency, factors to two places, the zone by name. */
function shown(c: AmendmentChange, v: AmendmentChange["before"], currency: string, regime: string): string {
  if (v === null) return "—";
  if (typeof v === "string") return c.key === "zone" ? zoneName(v as "green" | "yellow" | "red", regime) : v;
  if (c.unit === "amount") return formatAmount(v, currency);
  if (c.unit === "factor") return formatFactor(v);
  return String(v);
}

const CHANGE_WORDS = { added: "Added", removed: "Removed", changed: "Changed" } as const;

/**
 * An amendment's before and after, as it was frozen when the amendment was prepared: the filed
 * snapshot it amends (when and by whom it was filed, its hash), the capital impact, every figure that
 * changed and the exceptions added, removed or changed.
 */
export function AmendmentChanges({
  amendment,
  currency,
  regime,
  snapshotHref,
}: {
  amendment: AmendmentRecord;
  currency: string;
  regime: string;
  snapshotHref: (id: number) => string;
}) {
  const o = amendment.original;
  const impact = amendment.capitalImpact;
  return (
    <Subsection titleId="amendment-title" title="What this amendment changes">
      <p className="text-sm text-ink-soft">
        It amends <Link to={snapshotHref(o.snapshotId)}>snapshot #{o.snapshotId}</Link>, filed{" "}
        {o.filedAt ? <span className="figures">{formatDateTime(o.filedAt)}</span> : "earlier"}
        {o.filedBy ? ` by ${o.filedBy}` : ""}. That filing and its pack stay exactly as filed.
        {amendment.reason && <span className="mt-0.5 block text-xs text-ink-muted">Why: {amendment.reason}</span>}
      </p>
      <dl className="grid grid-cols-2 gap-x-6 gap-y-3 border-y border-rule py-3 sm:grid-cols-3">
        <Figure label="Capital as filed">{formatAmount(impact.before, currency)}</Figure>
        <Figure label="Capital as amended">{formatAmount(impact.after, currency)}</Figure>
        <Figure label="Capital impact" hint="amended minus filed">
          <span data-testid="capital-impact">
            {impact.change === null
              ? "Not available"
              : `${impact.change > 0 ? "+" : ""}${formatAmount(impact.change, currency)}`}
          </span>
        </Figure>
        <Figure label="Original snapshot hash" hint="the filed snapshot's seal" className="col-span-2 sm:col-span-3">
          <FullHash value={o.hash} />
        </Figure>
      </dl>
      {amendment.changes.length === 0 ? (
        <p className="text-sm text-ink-muted">No figure changed against the filed snapshot.</p>
      ) : (
        <Table caption={`Before and after: ${amendment.changes.length} figures changed`}>
          <TableHead
            columns={["Figure", "Template row", { numeric: "Before (as filed)" }, { numeric: "After (amended)" }]}
          />
          <tbody>
            {amendment.changes.map((c) => (
              <tr key={`${c.group}-${c.key}`}>
                <Td>{c.label}</Td>
                <Td className="figures text-xs">{c.templateRow ?? "—"}</Td>
                <Td numeric>{shown(c, c.before, currency, regime)}</Td>
                <Td numeric className="font-medium">
                  {shown(c, c.after, currency, regime)}
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
      {amendment.exceptions.length > 0 && (
        <Table caption="Exceptions added, removed or changed">
          <TableHead columns={["Date", "Change", "What changed"]} />
          <tbody>
            {amendment.exceptions.map((e) => (
              <tr key={e.date}>
                <Td className="figures whitespace-nowrap">{e.date}</Td>
                <Td>{CHANGE_WORDS[e.change]}</Td>
                <Td className="text-xs">{e.detail}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      )}
    </Subsection>
  );
}
