/**
 * The invented Larkspur Bank group (docs/architecture.md#demo-data): people, legal entities, portfolios, holiday
 * calendars and supervisor assignments. No real institution, person or data.
 */
import { sequelize } from "../server/db/sequelize";
import { config } from "../server/config";
import { UserModel } from "../server/models/user";
import { EntityModel } from "../server/models/entity";
import { PortfolioModel } from "../server/models/portfolio";
import { HolidayModel } from "../server/models/holiday";
import { RegulatorAssignmentModel } from "../server/models/regulator-assignment";
import { hashPassword } from "../server/modules/auth/auth.service";
import type { PnlBasis, RegimeId, Role } from "../shared/schemas/common";

export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: "admin@larkspur.test", name: "Ines Vantongeren", role: "admin" },
  // A second administrator: granting the CRO or admin role needs one to propose and another to approve.
  { email: "admin2@larkspur.test", name: "Jonas Halloran", role: "admin" },
  { email: "analyst@larkspur.test", name: "Theo Marchetti", role: "analyst" },
  { email: "analyst2@larkspur.test", name: "Priya Ramanathan", role: "analyst" },
  { email: "cro@larkspur.test", name: "Margot Ellsworth", role: "cro" },
  { email: "treasury@larkspur.test", name: "Daniel Okonkwo-Reyes", role: "treasury" },
  { email: "regulator@larkspur.test", name: "Sofia Lindqvist", role: "regulator" },
  { email: "regulator2@larkspur.test", name: "Martin Achterberg", role: "regulator" },
];

interface DemoEntity {
  code: string;
  name: string;
  regime: RegimeId;
  pnlBasis: PnlBasis;
  currency: string;
  supervisorName: string;
  supervisorEmails: string[];
  portfolios: { code: string; name: string; level: "top" | "desk" }[];
  holidays: [monthDay: string, name: string][];
}

export const DEMO_ENTITIES: DemoEntity[] = [
  {
    code: "LKS-EU",
    name: "Larkspur Markets SA",
    regime: "eu",
    pnlBasis: "max",
    currency: "EUR",
    supervisorName: "Northern Banking Authority (fictional)",
    supervisorEmails: ["market-risk@nba-supervision.test"],
    portfolios: [{ code: "LKS-EU-TOTAL", name: "Larkspur Markets SA — trading book", level: "top" }],
    holidays: [
      ["01-01", "New Year's Day"],
      ["05-01", "Labour Day"],
      ["12-25", "Christmas Day"],
      ["12-26", "St Stephen's Day"],
    ],
  },
  {
    code: "LKS-US",
    name: "Larkspur Securities LLC",
    regime: "us",
    pnlBasis: "actual",
    currency: "USD",
    supervisorName: "Federal Capital Review Office (fictional)",
    supervisorEmails: ["backtesting@fcro-supervision.test"],
    portfolios: [{ code: "LKS-US-TOTAL", name: "Larkspur Securities LLC — covered positions", level: "top" }],
    holidays: [
      ["01-01", "New Year's Day"],
      ["06-19", "Juneteenth"],
      ["07-04", "Independence Day"],
      ["12-25", "Christmas Day"],
    ],
  },
  {
    code: "LKS-AP",
    name: "Larkspur Asia Ltd",
    regime: "basel",
    pnlBasis: "max",
    currency: "SGD",
    supervisorName: "Straits Prudential Board (fictional)",
    supervisorEmails: ["imm-returns@spb-supervision.test"],
    portfolios: [{ code: "LKS-AP-TOTAL", name: "Larkspur Asia Ltd — trading book", level: "top" }],
    holidays: [
      ["01-01", "New Year's Day"],
      ["05-01", "Labour Day"],
      ["08-09", "National Day"],
      ["12-25", "Christmas Day"],
    ],
  },
  {
    code: "LKS-UK",
    name: "Larkspur Bank plc",
    regime: "frtb",
    pnlBasis: "max",
    currency: "GBP",
    supervisorName: "Thames Prudential Office (fictional)",
    supervisorEmails: ["frtb-ima@tpo-supervision.test", "desk-reviews@tpo-supervision.test"],
    portfolios: [
      { code: "LKS-UK-TOTAL", name: "Larkspur Bank plc — IMA trading desks", level: "top" },
      { code: "LKS-UK-RATES", name: "Rates desk", level: "desk" },
      { code: "LKS-UK-FX", name: "FX desk", level: "desk" },
      { code: "LKS-UK-CREDIT", name: "Credit desk", level: "desk" },
      { code: "LKS-UK-EQUITIES", name: "Equities desk", level: "desk" },
    ],
    holidays: [
      ["01-01", "New Year's Day"],
      ["12-25", "Christmas Day"],
      ["12-26", "Boxing Day"],
    ],
  },
];

/** Regulator → entities they may read. */
export const DEMO_ASSIGNMENTS: Record<string, string[]> = {
  "regulator@larkspur.test": ["LKS-EU", "LKS-UK"],
  "regulator2@larkspur.test": ["LKS-US"],
};

/** The fixed-date holiday in each year, where it falls on a weekday (a weekend holiday changes no business day). */
function holidayDates(monthDay: string, fromYear: number, toYear: number): string[] {
  const dates: string[] = [];
  for (let y = fromYear; y <= toYear; y++) {
    const weekday = new Date(`${y}-${monthDay}T00:00:00Z`).getUTCDay();
    if (weekday !== 0 && weekday !== 6) dates.push(`${y}-${monthDay}`);
  }
  return dates;
}

export async function up(): Promise<void> {
  const passwordHash = await hashPassword(config.demoPassword);
  const thisYear = new Date().getUTCFullYear();
  await sequelize.transaction(async (transaction) => {
    const users = new Map<string, UserModel>();
    for (const u of DEMO_USERS) {
      users.set(u.email, await UserModel.create({ ...u, passwordHash, lastSignInAt: null }, { transaction }));
    }
    for (const e of DEMO_ENTITIES) {
      const entity = await EntityModel.create(
        {
          code: e.code,
          name: e.name,
          regime: e.regime,
          pnlBasis: e.pnlBasis,
          currency: e.currency,
          qualitativeAddend: 0,
          supervisorName: e.supervisorName,
          supervisorEmails: e.supervisorEmails,
        },
        { transaction },
      );
      for (const p of e.portfolios) await PortfolioModel.create({ ...p, entityId: entity.id }, { transaction });
      for (const [monthDay, name] of e.holidays) {
        for (const date of holidayDates(monthDay, thisYear - 4, thisYear + 1)) {
          await HolidayModel.create({ entityId: entity.id, date, name }, { transaction });
        }
      }
      for (const [email, codes] of Object.entries(DEMO_ASSIGNMENTS)) {
        if (codes.includes(e.code)) {
          await RegulatorAssignmentModel.create({ userId: users.get(email)!.id, entityId: entity.id }, { transaction });
        }
      }
    }
  });
}
