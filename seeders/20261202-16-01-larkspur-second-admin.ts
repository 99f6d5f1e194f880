/**
 * The demo's second administrator (invented), for databases seeded before there was one: granting
 * or removing the CRO or administrator role needs one administrator to propose and another to
 * approve. Seeded directly with the demo password, like every demo user; a fresh database already
 * has them from the foundation seeder, and then this does nothing.
 */
import { config } from "../server/config";
import { UserModel } from "../server/models/user";
import { hashPassword } from "../server/modules/auth/auth.service";
import { DEMO_USERS } from "./20261201-0001-larkspur-foundation";

export async function up(): Promise<void> {
  const second = DEMO_USERS.find((u) => u.email === "admin2@larkspur.test")!;
  if (await UserModel.findOne({ where: { email: second.email } })) return;
  await UserModel.create({ ...second, passwordHash: await hashPassword(config.demoPassword), lastSignInAt: null });
}

export async function down(): Promise<void> {
  await UserModel.destroy({ where: { email: "admin2@larkspur.test", lastSignInAt: null } });
}
