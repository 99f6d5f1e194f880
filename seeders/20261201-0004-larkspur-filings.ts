/**
 * The signed-off demo quarters filed with each entity's (fictional) supervisor, the way the CRO
 * does it: the pack goes by e-mail through the local mail sink and is kept with its sha256. The
 * newest signed-off quarter of each entity is left approved, for the CRO to file in the demo;
 * the assigned regulator has acknowledged every filing but the newest, which waits for them.
 */
import { SnapshotModel } from "../server/models/snapshot";
import { EntityModel } from "../server/models/entity";
import { RegulatorAssignmentModel } from "../server/models/regulator-assignment";
import { UserModel } from "../server/models/user";
import { acknowledgeFiling, fileSnapshot } from "../server/modules/filings/filings.service";
import { actorOf, demoActor } from "./demo/actor";

export async function up(): Promise<void> {
  const cro = await demoActor("cro@larkspur.test");
  for (const entity of await EntityModel.findAll({ order: [["code", "ASC"]] })) {
    const approved = await SnapshotModel.findAll({
      where: { entityId: entity.id, status: "approved" },
      order: [["quarterEnd", "ASC"]],
    });
    const regulators = await RegulatorAssignmentModel.findAll({ where: { entityId: entity.id } });
    const toFile = approved.slice(0, -1);
    for (const [i, snapshot] of toFile.entries()) {
      const { filing } = await fileSnapshot(snapshot.id, cro);
      if (i === toFile.length - 1) continue;
      for (const assignment of regulators.slice(0, 1)) {
        const regulator = await UserModel.findByPk(assignment.userId);
        if (regulator) await acknowledgeFiling(filing.id, actorOf(regulator));
      }
    }
  }
}
