import type { PendingInvitation } from "@shared/schemas/user";
import { Table, TableHead, Td, Tr } from "@/components/ui/table";
import { formatDateTime } from "@/lib/format";
import { roleLabels } from "@/lib/role-labels";
import { PersonName } from "@/lib/people";

/** Links sent and not used yet: who, for what, by whom, and until when (an expired one needs a new link). */
export function PendingInvitationsTable({ invitations }: { invitations: PendingInvitation[] }) {
  if (invitations.length === 0) {
    return <p className="text-sm text-ink-muted">No links are waiting: everyone invited has set their password.</p>;
  }
  return (
    <Table caption="Links not used yet">
      <TableHead
        columns={["Name", "E-mail", "Role", "Link", "Sent by", { numeric: "Sent" }, { numeric: "Works until" }]}
      />
      <tbody>
        {invitations.map((i) => (
          <Tr key={i.id}>
            <Td className="font-medium">{i.name}</Td>
            <Td>{i.email}</Td>
            <Td>{roleLabels[i.role]}</Td>
            <Td>{i.purpose === "invite" ? "Invitation" : "Password reset"}</Td>
            <Td>
              <PersonName email={i.createdBy} />
            </Td>
            <Td numeric className="whitespace-nowrap">
              {formatDateTime(i.createdAt)}
            </Td>
            <Td numeric className="whitespace-nowrap">
              {i.expired ? (
                <span className="text-danger">Expired {formatDateTime(i.expiresAt)}: send a new one</span>
              ) : (
                formatDateTime(i.expiresAt)
              )}
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
