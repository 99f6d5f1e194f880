import { RegulatorAssignmentModel } from "../../models/regulator-assignment";
import { UserModel } from "../../models/user";
import { EntityModel } from "../../models/entity";
import { ConflictError, NotFoundError, BadRequestError } from "../../errors";
import { recordAudit } from "../audit/audit.service";
import { sequelize } from "../../db/sequelize";
import { findEntity } from "../entities/entities.service";
import type { SignedIn } from "../../kit/actor";
import type { Assignment } from "../../../shared/schemas/assignment";

export async function listAssignments(): Promise<Assignment[]> {
  const rows = await RegulatorAssignmentModel.findAll({
    include: [
      { model: UserModel, as: "user" },
      { model: EntityModel, as: "entity" },
    ],
  });
  return rows
    .map((row) => {
      const { user, entity } = row as unknown as { user: UserModel; entity: EntityModel };
      return { userId: user.id, email: user.email, name: user.name, entityCode: entity.code };
    })
    .sort((a, b) => a.email.localeCompare(b.email) || a.entityCode.localeCompare(b.entityCode));
}

/** Gives a supervisor's staff member sight of one entity's filed packs. */
export async function assignRegulator(userId: number, entityCode: string, actor: SignedIn): Promise<Assignment> {
  const user = await UserModel.findByPk(userId);
  if (!user) throw new NotFoundError(`No user with id ${userId}.`);
  if (user.role !== "regulator")
    throw new BadRequestError(`${user.email} is not a regulator; only regulators are assigned to entities.`);
  const entity = await findEntity(entityCode);
  if (await RegulatorAssignmentModel.findOne({ where: { userId, entityId: entity.id } })) {
    throw new ConflictError(`${user.email} is already assigned to ${entityCode}.`);
  }
  const assignment = { userId, email: user.email, name: user.name, entityCode };
  await sequelize.transaction(async (transaction) => {
    await RegulatorAssignmentModel.create({ userId, entityId: entity.id }, { transaction });
    await recordAudit(actor, "assignment.create", `${user.email} → ${entityCode}`, { after: assignment }, transaction);
  });
  return assignment;
}

export async function unassignRegulator(userId: number, entityCode: string, actor: SignedIn): Promise<void> {
  const entity = await findEntity(entityCode);
  const row = await RegulatorAssignmentModel.findOne({ where: { userId, entityId: entity.id } });
  if (!row) throw new NotFoundError(`User ${userId} is not assigned to ${entityCode}.`);
  await sequelize.transaction(async (transaction) => {
    await row.destroy({ transaction });
    await recordAudit(
      actor,
      "assignment.delete",
      `${userId} → ${entityCode}`,
      { before: { userId, entityCode } },
      transaction,
    );
  });
}
