/**
 * Three years of invented daily data for every Larkspur portfolio, ending on the last business
 * day before the seed runs (so the current quarter is always in progress), brought in through
 * the same upload service an analyst uses: preview, then commit.
 */
import { EntityModel } from "../server/models/entity";
import { HolidayModel } from "../server/models/holiday";
import { UserModel } from "../server/models/user";
import { commitUpload } from "../server/modules/uploads/upload-commit";
import { previewUpload } from "../server/modules/uploads/uploads.service";
import { toSessionUser } from "../server/modules/auth/auth.service";
import { serialiseObservationCsv } from "../shared/ingest/parse-csv";
import { demoDates, demoRowsFor, SCENARIO } from "./demo/scenario";

export async function up(): Promise<void> {
  const analyst = await UserModel.findOne({ where: { email: "analyst@larkspur.test" } });
  if (!analyst) throw new Error("The demo analyst is missing: the foundation seed must run first.");
  const actor = { user: toSessionUser(analyst), ip: "127.0.0.1", requestId: "demo-seed" };
  const today = new Date().toISOString().slice(0, 10);
  for (const code of Object.keys(SCENARIO)) {
    const entity = await EntityModel.findOne({ where: { code } });
    if (!entity) continue;
    const holidays = new Set((await HolidayModel.findAll({ where: { entityId: entity.id } })).map((h) => h.date));
    const csv = serialiseObservationCsv(demoRowsFor(code, demoDates(today, holidays)));
    const preview = await previewUpload(
      { originalName: `${code.toLowerCase()}-daily-history.csv`, bytes: Buffer.from(csv) },
      actor,
    );
    if (preview.invalid > 0)
      throw new Error(
        `Demo data for ${code} did not pass its own checks: ${JSON.stringify(preview.errors.slice(0, 3))}`,
      );
    await commitUpload(preview.id, actor);
  }
}
