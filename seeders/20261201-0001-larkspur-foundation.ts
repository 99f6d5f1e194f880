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
import { publicHolidays } from "../server/modules/entities/holiday-library";
import type { PnlBasis, RegimeId, Role } from "../shared/schemas/common";
import type { CalendarCountry } from "../shared/schemas/entity";

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
  /** Whose public holidays the calendar imports from the library (docs/rules.md#business-days). */
  country: CalendarCountry;
  supervisorName: string;
  supervisorEmails: string[];
  portfolios: { code: string; name: string; level: "top" | "desk" }[];
  /** The bank's own closing days on top of the public holidays, by month and day. */
  bankDays: [monthDay: string, name: string][];
}

export const DEMO_ENTITIES: DemoEntity[] = [
  {
    code: "LKS-EU",
    name: "Larkspur Markets SA",
    regime: "eu",
    pnlBasis: "max",
    currency: "EUR",
    country: "LU",
    supervisorName: "Northern Banking Authority (fictional)",
    supervisorEmails: ["market-risk@nba-supervision.test"],
    portfolios: [{ code: "LKS-EU-TOTAL", name: "Larkspur Markets SA — trading book", level: "top" }],
    bankDays: [["12-24", "Christmas Eve (offices closed)"]],
  },
  {
    code: "LKS-US",
    name: "Larkspur Securities LLC",
    regime: "us",
    pnlBasis: "actual",
    currency: "USD",
    country: "US",
    supervisorName: "Federal Capital Review Office (fictional)",
    supervisorEmails: ["backtesting@fcro-supervision.test"],
    portfolios: [{ code: "LKS-US-TOTAL", name: "Larkspur Securities LLC — covered positions", level: "top" }],
    bankDays: [],
  },
  {
    code: "LKS-AP",
    name: "Larkspur Asia Ltd",
    regime: "basel",
    pnlBasis: "max",
    currency: "SGD",
    country: "SG",
    supervisorName: "Straits Prudential Board (fictional)",
    supervisorEmails: ["imm-returns@spb-supervision.test"],
    portfolios: [{ code: "LKS-AP-TOTAL", name: "Larkspur Asia Ltd — trading book", level: "top" }],
    bankDays: [],
  },
  {
    code: "LKS-UK",
    name: "Larkspur Bank plc",
    regime: "frtb",
    pnlBasis: "max",
    currency: "GBP",
    country: "GB",
    supervisorName: "Thames Prudential Office (fictional)",
    supervisorEmails: ["frtb-ima@tpo-supervision.test", "desk-reviews@tpo-supervision.test"],
    portfolios: [
      { code: "LKS-UK-TOTAL", name: "Larkspur Bank plc — IMA trading desks", level: "top" },
      { code: "LKS-UK-RATES", name: "Rates desk", level: "desk" },
      { code: "LKS-UK-FX", name: "FX desk", level: "desk" },
      { code: "LKS-UK-CREDIT", name: "Credit desk", level: "desk" },
      { code: "LKS-UK-EQUITIES", name: "Equities desk", level: "desk" },
    ],
    bankDays: [["12-24", "Christmas Eve (offices closed)"]],
  },
];

/** Regulator → entities they may read. */
export const DEMO_ASSIGNMENTS: Record<string, string[]> = {
  "regulator@larkspur.test": ["LKS-EU", "LKS-UK"],
  "regulator2@larkspur.test": ["LKS-US"],
};

/** The fixed-date closing day in each year, where it falls on a weekday (a weekend changes no business day). */
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
          country: e.country,
          qualitativeAddend: 0,
          supervisorName: e.supervisorName,
          supervisorEmails: e.supervisorEmails,
        },
        { transaction },
      );
      for (const p of e.portfolios) await PortfolioModel.create({ ...p, entityId: entity.id }, { transaction });
      // The calendar as an admin's yearly import leaves it: the library's public holidays, then the bank's own days.
      const days = new Map<string, { name: string; source: "library" | "bank" }>();
      for (let year = thisYear - 4; year <= thisYear + 1; year++) {
        for (const h of publicHolidays(e.country, year)) days.set(h.date, { name: h.name, source: "library" });
      }
      for (const [monthDay, name] of e.bankDays) {
        for (const date of holidayDates(monthDay, thisYear - 4, thisYear + 1)) {
          if (!days.has(date)) days.set(date, { name, source: "bank" });
        }
      }
      for (const [date, day] of days) await HolidayModel.create({ entityId: entity.id, date, ...day }, { transaction });
      for (const [email, codes] of Object.entries(DEMO_ASSIGNMENTS)) {
        if (codes.includes(e.code)) {
          await RegulatorAssignmentModel.create({ userId: users.get(email)!.id, entityId: entity.id }, { transaction });
        }
      }
    }
  });
}
