import type { RegimeId } from "../schemas/common";
import type { SnapshotFigures } from "../schemas/snapshot";
import { getRegime } from "./regimes";
import { quarterStart } from "./quarters";

/**
 * The quarter's return data of one snapshot (docs/rules.md#return-data): for each field, the row
 * or item of the supervisory template it goes to (where the open standard names one), its value
 * and where the value comes from. Everything is read from the snapshot's frozen figures and the
 * analyst's inputs frozen with them; nothing is recomputed from current data, and a value the
 * product does not hold is never guessed: it is null until the analyst enters it.
 */

export type ReturnUnit = "amount" | "count" | "factor";

export interface ReturnField {
  key: string;
  label: string;
  /** The template row or item code, e.g. "C 24.00 r010 c040" or "FFIEC 102 item 1". */
  templateRow?: string;
  value: number | null;
  /** `amount` values are in `currency`; counts and factors have no currency. */
  unit: ReturnUnit;
  currency?: string;
  source: string;
  /** Set on a value the analyst enters (null until they do). */
  analystInput?: true;
}

export interface ReturnData {
  regime: RegimeId;
  quarterEnd: string;
  asOf: string;
  currency: string;
  fields: ReturnField[];
  /** The back-testing disclosure: the window's daily P&L against VaR, and each exception with its cause. */
  backtesting: {
    window: { start: string | null; end: string | null; observations: number };
    days: { date: string; actual: number | null; hypothetical: number | null; var99: number | null }[];
    exceptions: {
      date: string;
      actual: number | null;
      hypothetical: number | null;
      var99: number | null;
      cause: string | null;
      excluded: boolean;
    }[];
  } | null;
}

/** A value the product does not hold: the analyst enters it on the snapshot before submitting. */
export interface AnalystInputDef {
  key: string;
  label: string;
  templateRow?: string;
}

const EU_INPUTS: AnalystInputDef[] = [
  {
    key: "ircAverage",
    label: "Incremental default and migration risk: 12 weeks average measure",
    templateRow: "C 24.00 r010 c070",
  },
  { key: "ircLatest", label: "Incremental default and migration risk: last measure", templateRow: "C 24.00 r010 c080" },
  { key: "ctpFloor", label: "All price risks charge for the CTP: floor", templateRow: "C 24.00 r010 c090" },
  {
    key: "ctpAverage",
    label: "All price risks charge for the CTP: 12 weeks average measure",
    templateRow: "C 24.00 r010 c100",
  },
  { key: "ctpLatest", label: "All price risks charge for the CTP: last measure", templateRow: "C 24.00 r010 c110" },
];
const US_INPUTS: AnalystInputDef[] = [
  { key: "specificRiskDebt", label: "Specific risk add-on: debt positions", templateRow: "FFIEC 102 item 8" },
  { key: "specificRiskEquity", label: "Specific risk add-on: equity positions", templateRow: "FFIEC 102 item 9" },
  { key: "ircLatest", label: "Incremental risk measure: most recent" },
  { key: "ircAverage", label: "Incremental risk measure: 12 weeks average" },
  { key: "crmLatest", label: "Comprehensive risk measure: most recent" },
  { key: "crmAverage", label: "Comprehensive risk measure: 12 weeks average" },
];
const BASEL_INPUTS: AnalystInputDef[] = [
  { key: "ircLatest", label: "Incremental risk charge: most recent" },
  { key: "ircAverage", label: "Incremental risk charge: 12 weeks average" },
  { key: "crmLatest", label: "Comprehensive risk measure: most recent" },
  { key: "crmAverage", label: "Comprehensive risk measure: 12 weeks average" },
  { key: "specificRiskCharge", label: "Specific risk charge (standardised)" },
];
const FRTB_INPUTS: AnalystInputDef[] = [
  { key: "drc", label: "Default risk charge (internal model)" },
  { key: "standardisedCharge", label: "Standardised approach charge for desks outside the internal model" },
];

/**
 * The analyst inputs a snapshot's return asks for. Under FRTB the default risk charge and the
 * standardised charges come from the MAR33 aggregation when the snapshot holds it (`frtb`), so
 * they are asked for only when it does not.
 */
export function returnInputsFor(figures: Pick<SnapshotFigures, "regime" | "frtb">): AnalystInputDef[] {
  return figures.regime === "frtb" && figures.frtb ? [] : RETURN_INPUTS[figures.regime];
}

/** The analyst inputs each rule set asks for, in the order the return lists them. */
export const RETURN_INPUTS: Record<RegimeId, AnalystInputDef[]> = {
  eu: EU_INPUTS,
  us: US_INPUTS,
  basel: BASEL_INPUTS,
  frtb: FRTB_INPUTS,
};

const round2 = (v: number) => Math.round(v * 100) / 100;
const r = (v: number | null | undefined) => (v == null ? null : round2(v));

/** Maximum, mean, minimum and last of the values present, or nulls when there are none. */
function spread(values: (number | null)[]) {
  const present = values.filter((v): v is number => v !== null);
  if (present.length === 0) return { max: null, mean: null, min: null, end: null, count: 0 };
  return {
    max: round2(Math.max(...present)),
    mean: round2(present.reduce((a, b) => a + b, 0) / present.length),
    min: round2(Math.min(...present)),
    end: round2(present[present.length - 1]),
    count: present.length,
  };
}

/** The sum of the parts when every part is known; null (with what is missing) otherwise. */
function sumOrMissing(parts: [string, number | null][]): { value: number | null; missing: string[] } {
  const missing = parts.filter(([, v]) => v === null).map(([k]) => k);
  return { value: missing.length ? null : round2(parts.reduce((a, [, v]) => a + (v ?? 0), 0)), missing };
}

const maxOf = (...vs: (number | null)[]) => (vs.some((v) => v === null) ? null : Math.max(...(vs as number[])));

/** The return data of a snapshot: the one list of fields the JSON, the pack and any download read. */
export function returnData(figures: SnapshotFigures, quarterEnd: string): ReturnData {
  const f = figures;
  const cur = f.currency;
  const inputs = f.analystInputs ?? {};
  const input = (key: string): number | null => inputs[key] ?? null;
  const c = f.capitalDetail ?? null;
  const fields: ReturnField[] = [];
  const amountField = (key: string, label: string, value: number | null, source: string, templateRow?: string) =>
    fields.push({
      key,
      label,
      ...(templateRow ? { templateRow } : {}),
      value: r(value),
      unit: "amount",
      currency: cur,
      source,
    });
  const plain = (
    key: string,
    label: string,
    value: number | null,
    unit: ReturnUnit,
    source: string,
    templateRow?: string,
  ) => fields.push({ key, label, ...(templateRow ? { templateRow } : {}), value, unit, source });
  const inputField = (d: AnalystInputDef) =>
    fields.push({
      key: d.key,
      label: d.label,
      ...(d.templateRow ? { templateRow: d.templateRow } : {}),
      value: r(input(d.key)),
      unit: "amount",
      currency: cur,
      source: input(d.key) === null ? "Analyst input: not entered yet" : "Analyst input on the snapshot",
      analystInput: true,
    });
  const engine = (what: string) => `Engine, ${what} at ${f.asOf} (docs/rules.md#capital)`;
  /** Basel and FRTB: a measure's average over the previous 60 business days. */
  const average60 = (key: string, measure: string, value: number | null | undefined) =>
    amountField(key, `${measure}: average of the previous 60 business days`, value ?? null, engine("60-day average"));
  const ms = f.multiplierSvar ?? f.multiplier;
  const count = `Engine, counted exceptions over the ${f.window.observations} business days to ${f.asOf} (docs/rules.md#exception)`;
  /** US, Basel and FRTB: the window's counted exceptions (the EU return has its own row, overshootings). */
  const exceptionsField = (scope = "") =>
    plain(
      "exceptions",
      `Backtesting exceptions over the most recent 250 business days${scope}`,
      f.exceptions.counted,
      "count",
      count,
    );
  /** Where a multiplier comes from: the determination at the quarter end, under `rule` where the return names it. */
  const determined = (rule?: string) =>
    `Determination at the quarter end${rule ? `, ${rule}` : ""} (docs/rules.md#multiplier)`;

  if (f.regime === "eu") {
    // C 24.00 (MKR IM), row 010 total positions (docs/rules.md#return-data).
    amountField(
      "varAverageTimesMc",
      "VaR: multiplication factor (m_c) × average of previous 60 working days",
      c?.varAvg60 == null ? null : f.multiplier * c.varAvg60,
      engine("m_c × 60-day average of 10-day VaR"),
      "C 24.00 r010 c030",
    );
    amountField(
      "varPrevious",
      "VaR: previous day (VaR t−1)",
      c?.varPrev ?? null,
      engine("10-day VaR of the previous day"),
      "C 24.00 r010 c040",
    );
    amountField(
      "svarAverageTimesMs",
      "Stressed VaR: multiplication factor (m_s) × average of previous 60 working days",
      c?.svarAvg60 == null ? null : ms * c.svarAvg60,
      engine("m_s × 60-day average of 10-day stressed VaR"),
      "C 24.00 r010 c050",
    );
    amountField(
      "svarLatest",
      "Stressed VaR: latest available (SVaR t−1)",
      c?.svarPrev ?? null,
      engine("latest 10-day stressed VaR"),
      "C 24.00 r010 c060",
    );
    for (const d of EU_INPUTS) inputField(d);
    const irc = maxOf(input("ircAverage"), input("ircLatest"));
    const ctp = maxOf(input("ctpFloor"), input("ctpAverage"), input("ctpLatest"));
    const total = sumOrMissing([
      ["VaR", c?.varTerm ?? null],
      ["stressed VaR", c?.svarTerm ?? null],
      ["IRC", irc],
      ["CTP", ctp],
    ]);
    amountField(
      "ownFundsRequirement",
      "Own funds requirements",
      total.value,
      total.missing.length
        ? `Not complete: needs ${total.missing.join(", ")} (enter 0 where the entity has none)`
        : "max(VaR t−1, m_c × VaR avg) + max(SVaR t−1, m_s × SVaR avg) + max(IRC) + max(CTP), CRR Art. 364",
      "C 24.00 r010 c120",
    );
    amountField(
      "totalRiskExposureAmount",
      "Total risk exposure amount",
      total.value === null ? null : 12.5 * total.value,
      total.value === null
        ? "Not complete: follows from the own funds requirements"
        : "12.5 × own funds requirements, CRR Art. 92(4)",
      "C 24.00 r010 c130",
    );
    plain(
      "overshootings",
      "Number of overshootings during previous 250 working days",
      f.exceptions.counted,
      "count",
      count,
      "C 24.00 r010 c140",
    );
    plain(
      "multiplierVar",
      "VaR multiplication factor (m_c)",
      f.multiplier,
      "factor",
      determined("CRR Art. 366"),
      "C 24.00 r010 c150",
    );
    plain(
      "multiplierSvar",
      "SVaR multiplication factor (m_s)",
      ms,
      "factor",
      determined("CRR Art. 366"),
      "C 24.00 r010 c160",
    );
  } else if (f.regime === "us") {
    // FFIEC 102, the VaR-based and stressed VaR-based capital requirements (docs/rules.md#return-data).
    amountField(
      "varPrevious",
      "Previous day's VaR-based measure",
      c?.varPrev ?? null,
      engine("10-day VaR-based measure of the previous day"),
      "FFIEC 102 item 1",
    );
    amountField(
      "varAverage",
      "Average of the immediately preceding 60 business days VaR-based measures",
      c?.varAvg60 ?? null,
      engine("60-day average"),
      "FFIEC 102 item 2",
    );
    plain(
      "multiplier",
      "Multiplication factor (3.00 or higher, based on backtesting)",
      f.multiplier,
      "factor",
      determined("12 CFR 217.204(b)"),
      "FFIEC 102 item 3",
    );
    amountField(
      "varRequirement",
      "Greater of item 1 or item 2 × item 3",
      c?.varTerm ?? null,
      engine("VaR-based capital requirement"),
      "FFIEC 102 item 4",
    );
    amountField(
      "svarLatest",
      "Most recent stressed VaR-based measure",
      c?.svarPrev ?? null,
      engine("most recent weekly stressed measure"),
      "FFIEC 102 item 5",
    );
    amountField(
      "svarAverageTimesFactor",
      "Item 3 × average of the preceding 12 weeks stressed VaR-based measures",
      c?.svarAvg60 == null ? null : ms * c.svarAvg60,
      engine(`factor × average over ${c?.svarWeeks ?? 12} weekly stressed measures`),
      "FFIEC 102 item 6",
    );
    amountField(
      "svarRequirement",
      "Greater of item 5 or item 6",
      c?.svarTerm ?? null,
      engine("stressed VaR-based capital requirement"),
      "FFIEC 102 item 7",
    );
    for (const d of US_INPUTS) inputField(d);
    exceptionsField();
  } else if (f.regime === "basel") {
    amountField(
      "varPrevious",
      "VaR (10-day, 99%): previous day",
      c?.varPrev ?? null,
      engine("10-day VaR of the previous day"),
    );
    average60("varAverage", "VaR", c?.varAvg60);
    amountField("svarLatest", "Stressed VaR: latest", c?.svarPrev ?? null, engine("latest stressed VaR"));
    average60("svarAverage", "Stressed VaR", c?.svarAvg60);
    plain("multiplierVar", "Multiplication factor (m_c)", f.multiplier, "factor", determined());
    plain("multiplierSvar", "Stressed multiplication factor (m_s)", ms, "factor", determined());
    exceptionsField();
    amountField(
      "varSvarRequirement",
      "Requirement for VaR and stressed VaR",
      f.capital,
      engine(getRegime("basel").capitalCitation),
    );
    for (const d of BASEL_INPUTS) inputField(d);
  } else {
    amountField(
      "imccPrevious",
      "IMCC (expected shortfall): previous day",
      c?.esPrev ?? null,
      engine("IMCC of the previous day"),
    );
    average60("imccAverage", "IMCC", c?.esAvg60);
    amountField("sesPrevious", "SES: previous day", c?.sesPrev ?? null, engine("SES of the previous day"));
    average60("sesAverage", "SES", c?.sesAvg60);
    plain("multiplier", "Multiplier (m_c)", f.multiplier, "factor", determined("MAR33.41 with MAR99"));
    exceptionsField(" (top of house)");
    amountField(
      "imaRequirement",
      "Aggregate capital requirement for modellable risk factors (C_A)",
      f.capital,
      engine(getRegime("frtb").capitalCitation),
    );
    const a = f.frtb;
    if (a) {
      // MAR33.41–33.45 as the engine aggregated them at the quarter end (docs/rules.md#frtb-aggregation).
      const agg = (what: string) => `Engine, FRTB aggregation at ${f.asOf}: ${what} (docs/rules.md#frtb-aggregation)`;
      amountField("drc", "Default risk charge (internal model)", a.drc, agg(`DRC from ${a.sources.drc}`));
      amountField("imaGA", "IMA capital of the eligible desks (C_A + DRC)", a.imaGA, agg("MAR33.43"));
      amountField("cU", "Standardised charge of the desks out of the model (C_U)", a.cU, agg("MAR33.45"));
      amountField("saAll", "Standardised charge of all desks", a.saAll, agg(`from ${a.sources.saAll}`));
      amountField("surcharge", "Capital surcharge for amber desks", a.surcharge, agg(`k = ${a.k}, MAR33.45`));
      amountField("aggregateCapital", "Aggregate capital requirement", a.acrTotal, agg("MAR33.45"));
    } else for (const d of FRTB_INPUTS) inputField(d);
    plain(
      "desksPassing",
      "Desks passing backtesting and P&L attribution (green)",
      f.desks.filter((d) => d.passes && d.plaZone === "green").length,
      "count",
      "Engine, desk backtesting and PLA at the quarter end (docs/rules.md#frtb-desks)",
    );
    plain(
      "desksOut",
      "Desks out of the internal model (failed backtesting or red PLA)",
      f.desks.filter((d) => !d.passes || d.plaZone === "red").length,
      "count",
      "Engine, desk backtesting and PLA at the quarter end (docs/rules.md#frtb-desks)",
    );
  }

  // The quarter's disclosure figures: maximum, mean, minimum and period end over the quarter
  // (EU MR3 rows 1–8; docs/rules.md#return-data), on the 10-day capital measures.
  const inQuarter = (f.days ?? []).filter((d) => d.date >= quarterStart(quarterEnd) && d.date <= f.asOf);
  const disclose = (prefix: string, label: string, values: (number | null)[], firstRow: number | null) => {
    const s = spread(values);
    const source = f.days
      ? `Engine, the ${s.count} business days from ${quarterStart(quarterEnd)} to ${f.asOf} with a value`
      : "Not kept: the snapshot was prepared before the window's daily figures were kept";
    const row = (n: number) => (firstRow === null || f.regime !== "eu" ? undefined : `EU MR3 row ${firstRow + n}`);
    amountField(`${prefix}Max`, `${label}: maximum over the quarter`, s.max, source, row(0));
    amountField(`${prefix}Mean`, `${label}: mean over the quarter`, s.mean, source, row(1));
    amountField(`${prefix}Min`, `${label}: minimum over the quarter`, s.min, source, row(2));
    amountField(`${prefix}End`, `${label}: period end`, s.end, source, row(3));
  };
  if (f.regime === "frtb") {
    disclose(
      "disclosureEs",
      "Expected shortfall (97.5%)",
      inQuarter.map((d) => d.es),
      null,
    );
  } else {
    disclose(
      "disclosureVar",
      "VaR (10-day, 99%)",
      inQuarter.map((d) => d.varCapital),
      1,
    );
    disclose(
      "disclosureSvar",
      "Stressed VaR (10-day, 99%)",
      inQuarter.map((d) => d.svarCapital),
      5,
    );
  }

  return {
    regime: f.regime,
    quarterEnd,
    asOf: f.asOf,
    currency: cur,
    fields,
    backtesting: f.days
      ? {
          window: { start: f.window.start, end: f.window.end, observations: f.window.observations },
          days: f.days.map((d) => ({ date: d.date, actual: d.actual, hypothetical: d.hypothetical, var99: d.var99 })),
          exceptions: (f.exceptionDetail ?? []).map((e) => ({
            date: e.date,
            actual: e.actualPnl,
            hypothetical: e.hypotheticalPnl,
            var99: e.var99,
            cause: e.cause,
            excluded: e.excluded,
          })),
        }
      : null,
  };
}
