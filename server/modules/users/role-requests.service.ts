import type { Transaction } from "sequelize";
import { sequelize } from "../../db/sequelize";
import { AppError, ConflictError, ForbiddenError, NotFoundError } from "../../errors";
import { RoleRequestModel } from "../../models/role-request";
import { UserModel } from "../../models/user";
import { recordAudit } from "../audit/audit.service";
import {
  applyRole,
  auditView,
  inviteNewUser,
  lockUserAtVersion,
  pendingRequestFor,
  staleUser,
  toUser,
  type AdminActor,
} from "./users.service";
import { needsSecondAdmin, type ProposeRoleBody, type RoleRequest } from "../../../shared/schemas/user";
import type { Role } from "../../../shared/schemas/common";

const person = (u: UserModel | null | undefined) => (u ? { id: u.id, name: u.name, email: u.email } : null);

export async function toRoleRequest(row: RoleRequestModel, transaction?: Transaction): Promise<RoleRequest> {
  const [proposer, decider] = await Promise.all([
    row.proposer ?? UserModel.findByPk(row.proposedBy, { transaction }),
    row.decidedBy ? (row.decider ?? UserModel.findByPk(row.decidedBy, { transaction })) : null,
  ]);
  return {
    id: row.id,
    kind: row.kind,
    userId: row.userId,
    email: row.email,
    name: row.name,
    fromRole: row.fromRole,
    toRole: row.toRole,
    status: row.status,
    proposedBy: person(proposer)!,
    proposedAt: row.proposedAt.toISOString(),
    decidedBy: person(decider),
    decidedAt: row.decidedAt ? row.decidedAt.toISOString() : null,
  };
}

/** Records a proposed grant or removal (who, when, from → to) and notes it in the audit log. */
export async function createRoleRequest(
  request: {
    kind: "invite" | "change";
    userId: number | null;
    email: string;
    name: string;
    fromRole: Role | null;
    toRole: Role;
  },
  actor: AdminActor,
  transaction: Transaction,
): Promise<RoleRequestModel> {
  const row = await RoleRequestModel.create(
    { ...request, proposedBy: actor.user.id, decidedBy: null, decidedAt: null },
    { transaction },
  );
  await recordAudit(
    actor,
    "role_request.propose",
    request.email,
    { before: { role: request.fromRole }, after: { role: request.toRole, kind: request.kind, request: row.id } },
    transaction,
  );
  return row;
}

/** Pending requests, oldest first: what waits for a second administrator. */
export async function listPendingRoleRequests(): Promise<RoleRequest[]> {
  const rows = await RoleRequestModel.findAll({
    where: { status: "pending" },
    include: [{ model: UserModel, as: "proposer" }],
    order: [["proposedAt", "ASC"]],
  });
  return Promise.all(rows.map((r) => toRoleRequest(r)));
}

/**
 * Proposes granting or removing the CRO or administrator role of an existing user. Nothing about
 * the user changes until another administrator approves. The version is the one the admin saw
 * (409 `stale` otherwise); one request per person waits at a time.
 */
export async function proposeRoleChange(
  { userId, role, version }: ProposeRoleBody,
  actor: AdminActor,
): Promise<RoleRequest> {
  if (userId === actor.user.id) {
    throw new ForbiddenError("You cannot change your own role; another administrator can propose it.", "self_lockout");
  }
  return sequelize.transaction(async (transaction) => {
    const user = await lockUserAtVersion(userId, version, transaction);
    if (!needsSecondAdmin(user.role, role)) {
      throw new AppError(
        422,
        "no_approval_needed",
        `Moving ${user.name} from ${user.role} to ${role} neither grants nor removes the chief risk officer or administrator role: change it directly.`,
      );
    }
    const waiting = await pendingRequestFor(user.email, transaction);
    if (waiting) {
      throw new ConflictError(
        `A change of ${user.name}'s role to ${waiting.toRole} is already waiting for approval; approve or reject it first.`,
      );
    }
    const row = await createRoleRequest(
      { kind: "change", userId: user.id, email: user.email, name: user.name, fromRole: user.role, toRole: role },
      actor,
      transaction,
    );
    return toRoleRequest(row, transaction);
  });
}

/** The pending request, locked; refused when it was decided already or the actor may not decide it. */
async function lockPending(id: number, actor: AdminActor, transaction: Transaction): Promise<RoleRequestModel> {
  const row = await RoleRequestModel.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw new NotFoundError(`No role request with id ${id}.`);
  if (row.status !== "pending") {
    const decider = row.decidedBy ? await UserModel.findByPk(row.decidedBy, { transaction }) : null;
    throw new ConflictError(
      `This request was already ${row.status}${decider ? ` by ${decider.name}` : ""}. Nothing was changed.`,
      { current: await toRoleRequest(row, transaction) },
    );
  }
  if (row.userId !== null && row.userId === actor.user.id) {
    throw new ForbiddenError("This request is about your own role: another administrator decides it.", "four_eyes");
  }
  return row;
}

async function decide(
  row: RoleRequestModel,
  status: "approved" | "rejected",
  actor: AdminActor,
  transaction: Transaction,
) {
  row.status = status;
  row.decidedBy = actor.user.id;
  row.decidedAt = new Date();
  await row.save({ transaction });
  await recordAudit(
    actor,
    status === "approved" ? "role_request.approve" : "role_request.reject",
    row.email,
    {
      before: { role: row.fromRole },
      after: { role: row.toRole, kind: row.kind, request: row.id, proposedBy: row.proposedBy },
    },
    transaction,
  );
}

/**
 * A second administrator approves: the role change takes effect (the user's sessions end), or,
 * for a new person, the account is created and the invitation sent. The proposer cannot approve
 * their own request (403), nor can the person whose role it is.
 */
export async function approveRoleRequest(id: number, actor: AdminActor): Promise<RoleRequest> {
  return sequelize.transaction(async (transaction) => {
    const row = await lockPending(id, actor, transaction);
    if (row.proposedBy === actor.user.id) {
      throw new ForbiddenError(
        "You proposed this change, so another administrator must approve it. Nothing was changed.",
        "four_eyes",
      );
    }
    if (row.kind === "change") {
      const user = await UserModel.findByPk(row.userId!, { transaction, lock: transaction.LOCK.UPDATE });
      if (!user) throw new NotFoundError("The user of this request no longer exists.");
      if (user.role !== row.fromRole) throw staleUser(user);
      const before = auditView(toUser(user));
      await applyRole(user, row.toRole, actor, transaction);
      user.version = user.version + 1;
      await user.save({ transaction });
      await recordAudit(actor, "user.update", user.email, { before, after: auditView(toUser(user)) }, transaction);
    } else {
      if (await UserModel.findOne({ where: { email: row.email }, transaction })) {
        throw new ConflictError(`A user with the e-mail ${row.email} exists by now; reject this request.`);
      }
      const { user } = await inviteNewUser({ email: row.email, name: row.name, role: row.toRole }, actor, transaction);
      row.userId = user.id;
    }
    await decide(row, "approved", actor, transaction);
    return toRoleRequest(row, transaction);
  });
}

/** Another administrator (or the proposer, withdrawing it) rejects the request: nothing changes. */
export async function rejectRoleRequest(id: number, actor: AdminActor): Promise<RoleRequest> {
  return sequelize.transaction(async (transaction) => {
    const row = await lockPending(id, actor, transaction);
    await decide(row, "rejected", actor, transaction);
    return toRoleRequest(row, transaction);
  });
}
