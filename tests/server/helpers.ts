import request from "supertest";
import bcrypt from "bcryptjs";
import { randomBytes } from "node:crypto";
import { createApp, type AppOptions } from "../../server/app";
import { UserModel } from "../../server/models/user";
import { EntityModel } from "../../server/models/entity";
import { PortfolioModel } from "../../server/models/portfolio";
import { RegulatorAssignmentModel } from "../../server/models/regulator-assignment";
import { signSessionToken, SESSION_COOKIE } from "../../server/modules/auth/tokens";
import type { PortfolioLevel, Role } from "../../shared/schemas/common";

export const TEST_PASSWORD = "correct horse battery staple";
let passwordHash: string | null = null;

/** A unique suffix so that each test makes its own rows in the shared test database. */
export function unique(prefix = ""): string {
  return `${prefix}${randomBytes(4).toString("hex")}`;
}

export function testApp(options: AppOptions = {}) {
  return createApp(options);
}

/** Creates a user with a known password (hashed once per file: bcrypt cost 12 is slow on purpose). */
export async function createTestUser(
  role: Role,
  overrides: Partial<{ email: string; name: string; disabled: boolean }> = {},
) {
  passwordHash ??= await bcrypt.hash(TEST_PASSWORD, 12);
  return UserModel.create({
    email: overrides.email ?? `${role}-${unique()}@tests.quartermark.test`,
    name: overrides.name ?? `Test ${role}`,
    role,
    passwordHash,
    disabled: overrides.disabled ?? false,
    lastSignInAt: null,
  });
}

/** The session cookie the server would issue for this user now (reads the current token version). */
export async function sessionCookieFor(userId: number): Promise<string> {
  const user = await UserModel.findByPk(userId, { rejectOnEmpty: true });
  return `${SESSION_COOKIE}=${signSessionToken(user.id, user.tokenVersion)}`;
}

/** Signs in through the real endpoint and returns an agent that carries the cookie. */
export async function signIn(app: ReturnType<typeof createApp>, email: string, password = TEST_PASSWORD) {
  const agent = request.agent(app);
  const res = await agent.post("/api/auth/login").send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in failed for ${email}: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent, res };
}

export async function createTestEntity(
  overrides: Partial<{ code: string; regime: "basel" | "us" | "eu" | "frtb" }> = {},
) {
  return EntityModel.create({
    code: overrides.code ?? `T-${unique().toUpperCase()}`,
    name: "Test entity",
    regime: overrides.regime ?? "eu",
    pnlBasis: "max",
    currency: "EUR",
    qualitativeAddend: 0,
    supervisorName: null,
    supervisorEmails: [],
  });
}

/** A portfolio of the entity, coded `<entity code>-<suffix>`: a top of house unless told otherwise. */
export function createTestPortfolio(entity: EntityModel, suffix = "TOP", name = "Top", level: PortfolioLevel = "top") {
  return PortfolioModel.create({ entityId: entity.id, code: `${entity.code}-${suffix}`, name, level });
}

/** A regulator assigned to the entity, so that it may read the entity's filings. */
export async function createAssignedRegulator(entityId: number) {
  const regulator = await createTestUser("regulator");
  await RegulatorAssignmentModel.create({ userId: regulator.id, entityId });
  return regulator;
}

export function cookieFrom(res: request.Response): string | undefined {
  const raw = res.headers["set-cookie"] as unknown as string[] | undefined;
  return raw?.find((c) => c.startsWith(`${SESSION_COOKIE}=`));
}
