/**
 * Engine benchmark (`npm run bench:engine`): the full rolling recomputation for 100 portfolios ×
 * 5,000 days under all four rule sets, against a bare typed-array floor over the same data, and
 * one portfolio's forecast. Prints readable lines, then one JSON line of figures as the last line.
 * Targets (issue 3): ≤ 150 ms median, ≤ 2× the floor, forecast ≤ 5 ms.
 */
import { performance } from "node:perf_hooks";
import { addBusinessDays } from "../shared/backtest/calendar";
import { forecastAt } from "../shared/backtest/forecast";
import { rollingArrays, type RollingRequest } from "../shared/backtest/rolling";
import type { Observation } from "../shared/backtest/types";
import { toSeries, type ObservationSeries } from "../shared/backtest/window";
import { normal, seededRandom } from "../seeders/demo/daily-data";

const PORTFOLIOS = 100;
const DAYS = 5000;
const WINDOW = 250;
const RUNS = 61;
const WARMUP = 8;
const FORECAST_RUNS = 51;

const dates: string[] = [];
for (let i = 0, d = "2007-01-02"; i < DAYS; i++, d = addBusinessDays(d, 1)) dates.push(d);

/** Volatility clusters (GARCH(1,1)), fat-ish tails, and a VaR that is slightly off for some portfolios. */
function generatePortfolio(p: number): ObservationSeries {
  const rand = seededRandom(0x9e3779b9 ^ (p * 7919));
  const actual = new Float64Array(DAYS);
  const hypothetical = new Float64Array(DAYS);
  const v = new Float64Array(DAYS);
  const scale = 1e5 * (1 + p / 10);
  const calibration = 0.9 + 0.2 * rand();
  let variance = 1;
  for (let i = 0; i < DAYS; i++) {
    const sigma = Math.sqrt(variance);
    const shock = normal(rand) * (rand() < 0.02 ? 2.5 : 1);
    const r = sigma * shock;
    actual[i] = r * scale;
    hypothetical[i] = (r + 0.1 * sigma * normal(rand)) * scale;
    v[i] = 2.326 * sigma * calibration * scale;
    variance = 0.05 + 0.1 * r * r + 0.85 * variance;
  }
  return { dates, actual, hypothetical, var: v, hasMissing: false };
}

const portfolios: ObservationSeries[] = [];
for (let p = 0; p < PORTFOLIOS; p++) portfolios.push(generatePortfolio(p));
const observations = PORTFOLIOS * DAYS;

const requests: RollingRequest[] = [{ regime: "basel" }, { regime: "us" }, { regime: "eu" }, { regime: "frtb" }];

let sink = 0;

function engineRun(): number {
  const t0 = performance.now();
  for (const s of portfolios) {
    const r = rollingArrays(s, requests, WINDOW);
    sink += r.regimes[3].counted[DAYS - 1] + r.regimes[1].levels[DAYS - 1] + r.regimes[0].levels[DAYS - 1];
  }
  return performance.now() - t0;
}

// The floor: only the comparison and the sliding count for both P&L series, into typed arrays.
const floorHitsA = new Uint8Array(DAYS);
const floorHitsH = new Uint8Array(DAYS);
function floorRun(): number {
  const t0 = performance.now();
  for (const s of portfolios) {
    const pa = s.actual;
    const ph = s.hypothetical;
    const pv = s.var;
    const ca = new Int16Array(DAYS);
    const ch = new Int16Array(DAYS);
    let a = 0;
    let h = 0;
    for (let i = 0; i < DAYS; i++) {
      const xa = -pa[i] > pv[i] ? 1 : 0;
      const xh = -ph[i] > pv[i] ? 1 : 0;
      floorHitsA[i] = xa;
      floorHitsH[i] = xh;
      a += xa;
      h += xh;
      if (i >= WINDOW) {
        a -= floorHitsA[i - WINDOW];
        h -= floorHitsH[i - WINDOW];
      }
      ca[i] = a;
      ch[i] = h;
    }
    sink += ca[DAYS - 1] + ch[DAYS - 1];
  }
  return performance.now() - t0;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

for (let i = 0; i < WARMUP; i++) {
  engineRun();
  floorRun();
}
const engineTimes: number[] = [];
const floorTimes: number[] = [];
for (let i = 0; i < RUNS; i++) {
  // Interleaved so both see the same machine state.
  floorTimes.push(floorRun());
  engineTimes.push(engineRun());
}

// One portfolio's forecast from plain observation objects, as the server would call it.
const one = portfolios[0];
const objects: Observation[] = one.dates.map((date, i) => ({
  date,
  actualPnl: one.actual[i],
  hypotheticalPnl: one.hypothetical[i],
  var99: one.var[i],
  svar99: one.var[i] * 1.8,
}));
const holidays = new Set(["2026-12-25", "2027-01-01"]);
const asOf = dates[DAYS - 1];
const horizon = addBusinessDays(asOf, 63, holidays);
const forecastTimes: number[] = [];
for (let i = 0; i < WARMUP + FORECAST_RUNS; i++) {
  const t0 = performance.now();
  const f = forecastAt(objects, { regime: "eu", asOf, date: horizon, holidays });
  const t = performance.now() - t0;
  sink += f.knownRemaining;
  if (i >= WARMUP) forecastTimes.push(t);
}

// For information: turning observation objects into the column form (done once per load).
const conversionStart = performance.now();
sink += toSeries(objects).var.length;
const conversionMs = performance.now() - conversionStart;

const medianMs = median(engineTimes);
const floorMedianMs = median(floorTimes);
const forecastMedianMs = median(forecastTimes);
const ratioToFloor = medianMs / floorMedianMs;
const round = (x: number, d = 3): number => Number(x.toFixed(d));

console.log(
  `engine bench: ${PORTFOLIOS} portfolios × ${DAYS} days = ${observations.toLocaleString("en-US")} observations, window ${WINDOW}`,
);
console.log(
  `  rolling recomputation, 4 rule sets: median ${medianMs.toFixed(2)} ms over ${RUNS} runs (min ${Math.min(...engineTimes).toFixed(2)}, max ${Math.max(...engineTimes).toFixed(2)}; target ≤ 150 ms)`,
);
console.log(
  `  bare typed-array floor:             median ${floorMedianMs.toFixed(2)} ms (ratio ${ratioToFloor.toFixed(2)}×; target ≤ 2×)`,
);
console.log(
  `  one portfolio's forecast:           median ${forecastMedianMs.toFixed(3)} ms over ${FORECAST_RUNS} runs (target ≤ 5 ms)`,
);
console.log(
  `  (objects → columns for one portfolio of ${DAYS} days, once: ${conversionMs.toFixed(2)} ms; checksum ${sink})`,
);
console.log(
  JSON.stringify({
    bench: "engine",
    observations,
    medianMs: round(medianMs),
    floorMedianMs: round(floorMedianMs),
    ratioToFloor: round(ratioToFloor),
    forecastMedianMs: round(forecastMedianMs),
  }),
);
