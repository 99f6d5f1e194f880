import { entityByCode } from "../../kit/lookups";
import type { ChainVerify, SnapshotVerify } from "../../../shared/schemas/snapshot";
import { verifyChain } from "../snapshot-chain/snapshot-chain";
import { visibleSnapshotRow } from "./snapshots.read";
import type { SignedIn } from "../../kit/actor";

/**
 * Checks the snapshot against the entity's signed chain (server/modules/snapshot-chain): the chain
 * must be whole (every link signed, numbered without gaps, ending at the signed head), and the
 * snapshot must stand as its newest link says — figures, inputs hash, status, restatement, history.
 */
export async function verifySnapshot(id: number, actor: SignedIn): Promise<SnapshotVerify> {
  const row = await visibleSnapshotRow(id, actor);
  const chain = await verifyChain(row.entityId);
  const own = chain.problems.filter((p) => p.snapshotId === row.id);
  const result = (valid: boolean, detail: string) => ({ valid, hash: row.hash, prevHash: row.prevHash, detail });
  if (own.length) return result(false, own.map((p) => p.detail).join(" "));
  const signed = chain.bodies.filter((b) => b.snapshotId === row.id);
  if (!row.hash && signed.length === 0) return result(false, "Not signed off yet: there is no seal to verify.");
  if (!chain.valid)
    return result(
      false,
      `The snapshot stands as signed, but the entity's chain does not verify: ${chain.problems.map((p) => p.detail).join(" ")}`,
    );
  const newest = signed.at(-1)!;
  return result(
    true,
    `The stored figures, inputs hash, status, restatement and history match what link ${newest.seq} of ${chain.links} signed (${newest.kind}), with the server's key; the entity's chain is whole up to its signed head.`,
  );
}

/** GET /api/entities/:code/chain/verify: the entity's whole chain, in words. */
export async function verifyEntityChain(code: string): Promise<ChainVerify> {
  const entity = await entityByCode(code);
  const chain = await verifyChain(entity.id);
  const more = chain.problems.length - 1;
  const detail = chain.valid
    ? chain.links
      ? `${code}: all ${chain.links} links carry the server's signature, follow each other without a gap up to the signed head, and every signed-off snapshot stands as its newest link says.`
      : `${code}: nothing is signed off yet, so the chain is empty.`
    : `${code}: ${chain.problems[0].detail}${more > 0 ? ` (and ${more} more problem${more > 1 ? "s" : ""})` : ""}`;
  return { entity: code, valid: chain.valid, links: chain.links, problems: chain.problems, detail };
}
