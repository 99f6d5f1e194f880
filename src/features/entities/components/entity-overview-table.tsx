import type { Entity } from "@shared/schemas/entity";
import type { Role } from "@shared/schemas/common";
import { Link } from "react-router-dom";
import { EmptyState, Table, TableHead, Td, Tr } from "@/components/ui/table";
import { formatDecimal } from "@/lib/format";
import { pnlBasisLabels, regimeLabels } from "@/lib/regime-labels";

function NextStepWhenEmpty({ role, addEntityHref }: { role: Role; addEntityHref?: string }) {
  switch (role) {
    case "admin":
      return (
        <EmptyState title="No legal entities yet">
          {addEntityHref ? <Link to={addEntityHref}>Add an entity</Link> : "Add an entity"} with its rule set, P&amp;L
          basis and currency; portfolios and the holiday calendar follow on its page.
        </EmptyState>
      );
    case "regulator":
      return (
        <EmptyState title="No entities are assigned to you">
          The bank's administrator assigns the entities whose filings you may read. Contact them if one is missing.
        </EmptyState>
      );
    default:
      return (
        <EmptyState title="No legal entities are set up yet">
          An administrator adds the entities and their portfolios; they appear here as soon as they exist.
        </EmptyState>
      );
  }
}

export function EntityOverviewTable({
  entities,
  role,
  addEntityHref,
}: {
  entities: Entity[];
  role: Role;
  addEntityHref?: string;
}) {
  if (entities.length === 0) return <NextStepWhenEmpty role={role} addEntityHref={addEntityHref} />;
  return (
    <Table caption="Legal entities and their backtesting rules">
      <TableHead
        columns={[
          "Code",
          "Entity",
          "Rule set",
          "P&L basis for the count",
          "Currency",
          { numeric: "Qualitative addend" },
        ]}
      />
      <tbody>
        {entities.map((e) => (
          <Tr key={e.code}>
            <Td className="font-medium whitespace-nowrap">{e.code}</Td>
            <Td>{e.name}</Td>
            <Td className="whitespace-nowrap">{regimeLabels[e.regime]}</Td>
            <Td>{pnlBasisLabels[e.pnlBasis]}</Td>
            <Td className="figures">{e.currency}</Td>
            <Td numeric>{formatDecimal(e.qualitativeAddend)}</Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
