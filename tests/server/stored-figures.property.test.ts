/**
 * Stored figures equal a fresh computation, whatever the writes (server/modules/figures): random
 * sequences of upload commits (new days and restated days), exception reviews with exclusion
 * requests, the CRO's exclusion decisions, holidays added or removed, and supervisory settings
 * proposed by an admin and approved by a CRO (effective inside the window, or after the last day
 * so that later commits carry the data past it) run against the real database through the
 * services the routes call; after each write, every stored figure of the entity (backtest, rolling
 * series, Overview line, the determinations of the multiplier, the starting point of the forecast
 * and the what-if) is compared with a recomputation from the data as it now is, the stored backtest
 * with the settings in force on its day (docs/rules.md#settings), and the forecast, what-if and
 * indicative count from the stored starting point with the engine on the whole history. Bounded: 20 runs of at most 6 writes each.
 */
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../server/db/sequelize";
import { AppError } from "../../server/errors";
import { EntityModel } from "../../server/models/entity";
import { PortfolioModel } from "../../server/models/portfolio";
import { toSessionUser } from "../../server/modules/auth/auth.service";
import { previewUpload } from "../../server/modules/uploads/uploads.service";
import { commitUpload } from "../../server/modules/uploads/upload-commit";
import { recordDecision, saveReview } from "../../server/modules/reviews/reviews.service";
import {
  addHoliday,
  importLibraryHolidays,
  previewHolidayImport,
  removeHoliday,
} from "../../server/modules/entities/entities.service";
import { storedStart } from "../../server/modules/figures/stored-figures";
import {
  entityWithPortfolios,
  loadStartingPoint,
  storedStartingPoint,
} from "../../server/modules/figures/engine-inputs";
import { addBusinessDays } from "../../shared/backtest/calendar";
import { forecastAt } from "../../shared/backtest/forecast";
import { whatIfFromCount } from "../../shared/backtest/what-if";
import { approveSettings, proposeSettings } from "../../server/modules/settings/settings.service";
import { approvedSettings, fallbackSettings } from "../../server/modules/settings/settings.read";
import { loadEntityEngineInputs, storedDeterminations } from "../../server/modules/determinations/determinations.store";
import {
  determinationsFor,
  indicativeAt,
  multipliersFor,
  settingsInForce,
  settingsOn,
} from "../../shared/backtest/determination";
import type { BacktestResponse } from "../../shared/schemas/backtest";
import { createTestEntity, createTestUser, unique } from "./helpers";
import { storedAndFresh } from "./support/stored-and-fresh";

type Actor = Parameters<typeof commitUpload>[1];

const HEADER = "portfolio,date,actual_pnl,hypothetical_pnl,var_99,var_975,svar_99";

/** Weekdays from a start date. */
function weekdays(from: string, count: number): string[] {
  const out: string[] = [];
  const d = new Date(`${from}T00:00:00Z`);
  while (out.length < count) {
    if (d.getUTCDay() !== 0 && d.getUTCDay() !== 6) out.push(d.toISOString().slice(0, 10));
    d.setUTCDate(d.getUTCDate() + 1);
  }
  return out;
}

/** A day's line: a loss beyond VaR (an exception) when `exception`, an ordinary day otherwise. */
function line(portfolio: string, date: string, seed: number, exception: boolean): string {
  const var99 = 1_000_000 + (seed % 97) * 1000;
  const pnl = exception ? -(var99 + 1000 + (seed % 13) * 5000) : ((seed * 7919) % 1_600_000) - 800_000;
  return `${portfolio},${date},${pnl.toFixed(2)},${(pnl * 0.98).toFixed(2)},${var99.toFixed(2)},${(var99 * 0.8).toFixed(2)},${(var99 * 2.3).toFixed(2)}`;
}

async function upload(actor: Actor, lines: string[]): Promise<boolean> {
  try {
    const preview = await previewUpload(
      { originalName: `prop-${unique()}.csv`, bytes: Buffer.from([HEADER, ...lines].join("\n") + "\n") },
      actor,
    );
    if (preview.invalid > 0) return false; // e.g. a restated day that has become a holiday
    await commitUpload(preview.id, actor);
    return true;
  } catch (err) {
    if (err instanceof AppError) return false; // a refused write changes nothing; the check still runs
    throw err;
  }
}

type Command =
  | { kind: "commit"; days: number; exceptions: boolean[]; seed: number }
  | { kind: "restate"; picks: number[]; exception: boolean; seed: number }
  | { kind: "review"; pick: number; exclusion: boolean }
  | { kind: "decide"; pick: number; approve: boolean }
  | { kind: "addHoliday"; pick: number }
  | { kind: "removeHoliday"; pick: number }
  | { kind: "importHolidays"; country: "GB" | "US"; year: 2025 | 2026 }
  | {
      kind: "settings";
      when: number;
      addend: number;
      floor: number | null;
      basis: "actual" | "hypothetical" | "max" | null;
    };

const command: fc.Arbitrary<Command> = fc.oneof(
  fc.record({
    kind: fc.constant("commit" as const),
    days: fc.integer({ min: 1, max: 5 }),
    exceptions: fc.array(fc.boolean(), { minLength: 5, maxLength: 5 }),
    seed: fc.nat(),
  }),
  fc.record({
    kind: fc.constant("restate" as const),
    picks: fc.array(fc.nat(), { minLength: 1, maxLength: 3 }),
    exception: fc.boolean(),
    seed: fc.nat(),
  }),
  fc.record({ kind: fc.constant("review" as const), pick: fc.nat(), exclusion: fc.boolean() }),
  fc.record({ kind: fc.constant("decide" as const), pick: fc.nat(), approve: fc.boolean() }),
  fc.record({ kind: fc.constant("addHoliday" as const), pick: fc.nat() }),
  fc.record({ kind: fc.constant("removeHoliday" as const), pick: fc.nat() }),
  fc.record({
    kind: fc.constant("importHolidays" as const),
    country: fc.constantFrom("GB" as const, "US" as const),
    year: fc.constantFrom(2025 as const, 2026 as const),
  }),
  fc.record({
    kind: fc.constant("settings" as const),
    // 0–59: a day inside the last 60 of the window; 60–69: a weekday after the last day with data.
    when: fc.integer({ min: 0, max: 69 }),
    addend: fc.constantFrom(0, 0.25, 0.5, 1),
    floor: fc.constantFrom(null, 3.5, 4),
    basis: fc.constantFrom(null, "actual" as const, "hypothetical" as const, "max" as const),
  }),
);

interface Run {
  entity: EntityModel;
  portfolio: string;
  dates: string[];
  analyst: Actor;
  cro: Actor;
  admin: Actor;
}

async function apply(run: Run, c: Command): Promise<void> {
  const { portfolio } = run;
  const exceptionDays = async () =>
    (
      await sequelize.query<{ d: string; s: string | null; v: number | null }>(
        `SELECT DATE_FORMAT(o.business_date, '%Y-%m-%d') AS d, r.exclusion_status AS s, r.version AS v
           FROM observations o JOIN portfolios p ON p.id = o.portfolio_id
           LEFT JOIN exception_reviews r ON r.portfolio_id = o.portfolio_id AND r.business_date = o.business_date
          WHERE p.code = :portfolio AND o.is_current = 1 AND -o.actual_pnl > o.var_99 ORDER BY o.business_date`,
        { replacements: { portfolio }, type: QueryTypes.SELECT },
      )
    ).map((r) => ({ date: r.d, status: r.s, version: r.v === null ? 0 : Number(r.v) }));
  const holidays = async () =>
    (
      await sequelize.query<{ d: string }>(
        "SELECT DATE_FORMAT(date, '%Y-%m-%d') AS d FROM holidays WHERE entity_id = :id ORDER BY date",
        { replacements: { id: run.entity.id }, type: QueryTypes.SELECT },
      )
    ).map((r) => r.d);
  const ignoreRefusal = async (write: () => Promise<unknown>) => {
    try {
      await write();
    } catch (err) {
      if (!(err instanceof AppError)) throw err;
    }
  };
  /** The write on the one of `list` that `pick` names, when the list has any; a refusal is a legitimate outcome. */
  const onPicked = async <T>(list: T[], pick: number, write: (item: T) => Promise<unknown>) => {
    if (list.length) await ignoreRefusal(() => write(list[pick % list.length]));
  };

  switch (c.kind) {
    case "commit": {
      const last = run.dates[run.dates.length - 1];
      const next = weekdays(last, c.days + 1).slice(1);
      const off = new Set(await holidays());
      const days = next.filter((d) => !off.has(d));
      if (
        await upload(
          run.analyst,
          days.map((d, i) => line(portfolio, d, c.seed + i, c.exceptions[i])),
        )
      )
        run.dates.push(...days);
      return;
    }
    case "restate": {
      const picked = [...new Set(c.picks.map((p) => run.dates[run.dates.length - 1 - (p % 60)]))];
      await upload(
        run.analyst,
        picked.map((d, i) => line(portfolio, d, c.seed + i, c.exception)),
      );
      return;
    }
    case "review": {
      await onPicked(await exceptionDays(), c.pick, (day) =>
        saveReview(
          portfolio,
          day.date,
          {
            cause: "market_move",
            narrative: "A large move in rates on the day.",
            exclusion: c.exclusion,
            version: day.version,
          },
          run.analyst,
        ),
      );
      return;
    }
    case "decide": {
      const days = (await exceptionDays()).filter((d) => d.status === "requested" || d.status === "approved");
      await onPicked(days, c.pick, (day) =>
        recordDecision(
          portfolio,
          day.date,
          {
            decision: c.approve ? "approved" : "rejected",
            reference: "SUP-2026-1",
            decidedOn: day.date,
            // A decision already recorded is corrected by a superseding record, which says why.
            correctionReason: day.status === "approved" ? "The supervisor corrected its letter" : undefined,
            version: day.version,
          },
          run.cro,
        ),
      );
      return;
    }
    case "addHoliday": {
      // A weekday in the last 60 days or the next 20 (roll-offs and forecasts look ahead).
      const span = [...run.dates.slice(-60), ...weekdays(run.dates[run.dates.length - 1], 21).slice(1)];
      await onPicked(span, c.pick, (date) => addHoliday(run.entity.code, { date, name: "Bank holiday" }, run.admin));
      return;
    }
    case "settings": {
      const last = run.dates[run.dates.length - 1];
      const effectiveFrom =
        c.when < 60 ? run.dates[run.dates.length - 1 - c.when] : weekdays(last, c.when - 58).at(-1)!;
      await ignoreRefusal(async () => {
        const proposed = await proposeSettings(
          run.entity.code,
          {
            effectiveFrom,
            reference: `SUP-${unique()}`,
            qualitativeAddend: c.addend,
            multiplierFloor: c.floor,
            ...(c.basis ? { pnlBasis: c.basis } : {}),
          },
          run.admin,
        );
        await approveSettings(proposed.id, {}, run.cro);
      });
      return;
    }
    case "importHolidays": {
      // The country alone moves no figure; the import that follows does (another country's days leave).
      await EntityModel.update({ country: c.country }, { where: { id: run.entity.id } });
      const plan = await previewHolidayImport(run.entity.code, c.year);
      await ignoreRefusal(() =>
        importLibraryHolidays(run.entity.code, { year: c.year, changes: plan.changes }, run.admin),
      );
      return;
    }
    case "removeHoliday": {
      await onPicked(await holidays(), c.pick, (date) => removeHoliday(run.entity.code, date, run.admin));
      return;
    }
  }
}

type DeterminationFields = Pick<
  ReturnType<typeof determinationsFor>[number],
  "periodEnd" | "effectiveFrom" | "effectiveTo" | "counted" | "plusFactor" | "multiplier"
>;

/** Every stored row of the entity against a fresh computation from the data as it now is. */
async function expectStoredEqualsRecomputed(entityId: number): Promise<void> {
  const { entity } = await entityWithPortfolios(entityId);
  for (const { portfolio: p, stored: row, fresh } of await storedAndFresh(entityId)) {
    expect(row, `a stored row for ${p.code}`).toBeDefined();
    expect(row!.asOf).toEqual(fresh.asOf);
    expect(row!.backtest).toEqual(fresh.backtest);
    expect(row!.rolling).toEqual(fresh.rolling);
    expect(row!.overview).toEqual(fresh.overview);
    expect(row!.start).toEqual(fresh.start);

    // Beside the recompute, an oracle from the engine: the stored backtest counts on the basis and
    // carries the multiplier of the settings in force on its own day, not the entity's columns.
    const stored = row!.backtest as BacktestResponse | null;
    if (stored) {
      const settings = settingsOn(await approvedSettings(entityId), stored.asOf) ?? fallbackSettings(entity);
      expect(stored.pnlBasis).toBe(settings.pnlBasis);
      expect(stored.multiplier).toBe(
        multipliersFor(stored.exceptions.counted, entity.regime, settings, 250, stored.plusFactor).multiplier,
      );
    }
  }
  // The determinations (none signed off here) against the engine on the data and settings as they now are.
  const inputs = await loadEntityEngineInputs(entity);

  // The stored starting point gives the forecast, the what-if and the in-force count that the whole
  // history gives (docs/rules.md#forecast), and the one read back from the database at the last day
  // is the stored one.
  const { start } = await storedStart(entity);
  expect(start === null).toBe(inputs.series.length === 0);
  if (start) {
    const asOf = inputs.series[inputs.series.length - 1].date;
    expect(start.asOf).toBe(asOf);
    const date = addBusinessDays(asOf, 40, inputs.options.holidays);
    const settings = settingsInForce(inputs.options, asOf);
    const opts = {
      regime: entity.regime,
      pnlBasis: settings.pnlBasis,
      asOf,
      qualitativeAddend: settings.qualitativeAddend,
      date,
    };
    expect(forecastAt(start.series, { ...opts, ...start.options })).toEqual(
      forecastAt(inputs.series, { ...opts, ...inputs.options }),
    );
    expect(indicativeAt(start.series, asOf, start.options)).toEqual(indicativeAt(inputs.series, asOf, inputs.options));
    const scenario = { regime: entity.regime, asOf, counted: 2, settings, extraExceptions: 1, varScale: 1.1 };
    expect(whatIfFromCount(start.series, scenario)).toEqual(whatIfFromCount(inputs.series, scenario));
    expect(settingsInForce(start.options, asOf)).toEqual(settings);
    const read = await loadStartingPoint(entity, inputs.portfolio!.id, asOf);
    expect(read && storedStartingPoint(read)).toEqual(storedStartingPoint(start));
  }
  // A determination's period, count, plus factor and multiplier, and the settings record it used: stored as computed.
  const compared = (d: DeterminationFields, settingsId: number | null) => ({
    periodEnd: d.periodEnd,
    effectiveFrom: d.effectiveFrom,
    effectiveTo: d.effectiveTo,
    counted: d.counted,
    plusFactor: d.plusFactor,
    multiplier: d.multiplier,
    settingsId,
  });
  const fresh = determinationsFor(inputs.series, inputs.options).map((d) => compared(d, d.settings.id));
  const storedDets = (await storedDeterminations(entityId)).map((d) => compared(d, d.settingsId));
  expect(storedDets).toEqual(fresh);
}

describe("stored figures (property)", () => {
  let users: { analyst: Actor; cro: Actor; admin: Actor };
  beforeAll(async () => {
    const actor = async (role: "analyst" | "cro" | "admin") => ({
      user: toSessionUser(await createTestUser(role)),
      ip: "127.0.0.1",
      requestId: `prop-${role}`,
    });
    users = { analyst: await actor("analyst"), cro: await actor("cro"), admin: await actor("admin") };
  });

  it("after every write in a random sequence, each stored figure equals a fresh recompute", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom("eu" as const, "us" as const, "basel" as const),
        fc.array(command, { minLength: 1, maxLength: 6 }),
        async (regime, commands) => {
          const entity = await createTestEntity({ regime });
          const code = `${entity.code}-TOP`;
          await PortfolioModel.create({ entityId: entity.id, code, name: "Top of house", level: "top" });
          // 260 business days to start with, an exception about every 25th day.
          const dates = weekdays("2025-01-06", 260);
          const run: Run = { entity, portfolio: code, dates, ...users };
          expect(
            await upload(
              users.analyst,
              dates.map((d, i) => line(code, d, i, i % 25 === 7)),
            ),
          ).toBe(true);
          await expectStoredEqualsRecomputed(entity.id);
          for (const c of commands) {
            await apply(run, c);
            await expectStoredEqualsRecomputed(entity.id);
          }
        },
      ),
      { numRuns: 20, seed: Number(process.env.PROPERTY_SEED ?? 20261202) },
    );
  }, 600_000);
});
