/**
 * Each demo entity's supervisory settings as its first governed record (in force from the start,
 * as the migration does for entities that already existed), and its determinations of the
 * multiplier computed and stored, the signed-off quarters' frozen with their snapshots. The stored
 * figures are refreshed with them: their starting points carry the settings records.
 */
import { sequelize } from "../server/db/sequelize";
import { EntityModel } from "../server/models/entity";
import { refreshEntityFigures } from "../server/modules/figures/stored-figures";
import { createInitialSettings, hasGovernedSettings } from "../server/modules/settings/settings.service";

export async function up(): Promise<void> {
  for (const entity of await EntityModel.findAll({ order: [["code", "ASC"]] })) {
    await sequelize.transaction(async (transaction) => {
      if (!(await hasGovernedSettings(entity.id, transaction))) await createInitialSettings(entity, transaction);
      await refreshEntityFigures([entity.id], transaction); // and the determinations, in the same call
    });
  }
}
