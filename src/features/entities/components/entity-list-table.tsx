import { Link } from "react-router-dom";
import type { Entity } from "@shared/schemas/entity";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { formatDecimal } from "@/lib/format";
import { pnlBasisLabels, regimeLabels } from "@/lib/regime-labels";

export function EntityListTable({ entities, hrefFor }: { entities: Entity[]; hrefFor: (code: string) => string }) {
  if (entities.length === 0) {
    return (
      <EmptyState title="No entities yet">
        Add the first legal entity with the form below. Choose its rule set first: the P&amp;L basis follows the rule
        set's default.
      </EmptyState>
    );
  }
  return (
    <Table caption="Legal entities">
      <TableHead
        columns={["Code", "Name", "Rule set", "P&L basis", "Currency", { numeric: "Qualitative addend" }, "Supervisor"]}
      />
      <tbody>
        {entities.map((e) => (
          <Tr key={e.code}>
            <Td className="font-medium whitespace-nowrap">
              <Link to={hrefFor(e.code)}>{e.code}</Link>
            </Td>
            <Td>{e.name}</Td>
            <Td className="whitespace-nowrap">{regimeLabels[e.regime]}</Td>
            <Td>{pnlBasisLabels[e.pnlBasis]}</Td>
            <Td className="figures">{e.currency}</Td>
            <Td numeric>{formatDecimal(e.qualitativeAddend)}</Td>
            <Td>
              {e.supervisorName ?? <span className="text-ink-muted">Not set</span>}
              {e.supervisorEmails.length > 0 && (
                <span className="block text-xs text-ink-muted">{e.supervisorEmails.join(", ")}</span>
              )}
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
