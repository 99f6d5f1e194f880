import { sequelize } from "../../db/sequelize";

/** Whether the API can reach its database right now. */
export async function checkHealth(): Promise<{ status: "ok" | "degraded"; db: "up" | "down" }> {
  const dbUp = await sequelize.query("SELECT 1").then(
    () => true,
    () => false,
  );
  return dbUp ? { status: "ok", db: "up" } : { status: "degraded", db: "down" };
}
