import { EngineInputError } from "./errors";

/**
 * Business-day arithmetic on YYYY-MM-DD strings in UTC: a business day is a weekday that is not
 * in the entity's holiday set. No time zones, no Date objects leak out.
 */

const MS_PER_DAY = 86_400_000;
const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/**
 * Days since 1970-01-01 of a calendar date, by the proleptic Gregorian civil-to-days formula
 * (H. Hinnant's days_from_civil), or undefined when there is no such date (30 February).
 */
export function civilDayNumber(y: number, m: number, d: number): number | undefined {
  const leap = (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
  if (!(m >= 1 && m <= 12 && d >= 1 && d <= (m === 2 && leap ? 29 : DAYS_IN_MONTH[m - 1]))) return undefined;
  const yy = m <= 2 ? y - 1 : y;
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Days since 1970-01-01 for a YYYY-MM-DD string: no Date object, so it is cheap on the ingest hot path. */
export function dayNumber(date: string): number {
  if (typeof date === "string" && ISO_DATE.test(date)) {
    const digit = (i: number) => date.charCodeAt(i) - 48;
    const day = civilDayNumber(
      digit(0) * 1000 + digit(1) * 100 + digit(2) * 10 + digit(3),
      digit(5) * 10 + digit(6),
      digit(8) * 10 + digit(9),
    );
    if (day !== undefined) return day;
  }
  throw new EngineInputError(`"${String(date)}" is not a real date written YYYY-MM-DD`, { date: String(date) });
}

export function fromDayNumber(day: number): string {
  return new Date(day * MS_PER_DAY).toISOString().slice(0, 10);
}

/** 0 = Sunday … 6 = Saturday. 1970-01-01 was a Thursday. */
function weekdayOf(day: number): number {
  return (((day + 4) % 7) + 7) % 7;
}

/** The holiday set as day numbers, built once per call rather than formatting a string per day tested. */
function holidayDays(holidays: ReadonlySet<string>): Set<number> {
  const out = new Set<number>();
  for (const h of holidays) if (ISO_DATE.test(h)) out.add(dayNumber(h));
  return out;
}

function isBusinessDayNumber(day: number, holidays: ReadonlySet<number>): boolean {
  const wd = weekdayOf(day);
  if (wd === 0 || wd === 6) return false;
  return holidays.size === 0 || !holidays.has(day);
}

export function isBusinessDay(date: string, holidays: ReadonlySet<string> = new Set()): boolean {
  const wd = weekdayOf(dayNumber(date));
  return wd !== 0 && wd !== 6 && !holidays.has(date);
}

/**
 * Business days d with from < d ≤ to (the days still to come after `from`, up to and including
 * `to`). Negative when `to` is before `from`.
 */
export function businessDaysBetween(from: string, to: string, holidays: ReadonlySet<string> = new Set()): number {
  const a = dayNumber(from);
  const b = dayNumber(to);
  if (b < a) return -businessDaysBetween(to, from, holidays);
  // Whole weeks hold five weekdays each; walk only the remainder, then take holidays out.
  const span = b - a;
  const weeks = Math.floor(span / 7);
  let count = weeks * 5;
  for (let d = a + weeks * 7 + 1; d <= b; d++) {
    const wd = weekdayOf(d);
    if (wd !== 0 && wd !== 6) count++;
  }
  for (const h of holidays) {
    if (!ISO_DATE.test(h)) continue;
    const d = dayNumber(h);
    if (d > a && d <= b) {
      const wd = weekdayOf(d);
      if (wd !== 0 && wd !== 6) count--;
    }
  }
  return count;
}

/**
 * The n-th business day after `date` (n > 0), before it (n < 0), or `date` itself (n = 0).
 */
export function addBusinessDays(date: string, n: number, holidays: ReadonlySet<string> = new Set()): string {
  if (!Number.isInteger(n)) throw new EngineInputError(`A number of business days must be a whole number, got ${n}`);
  const off = holidayDays(holidays);
  let day = dayNumber(date);
  const step = n >= 0 ? 1 : -1;
  let left = Math.abs(n);
  while (left > 0) {
    day += step;
    if (isBusinessDayNumber(day, off)) left--;
  }
  return fromDayNumber(day);
}

/**
 * The business days 1..count after `date` in one walk: element j − 1 is addBusinessDays(date, j).
 * Used to project many future observation dates at once.
 */
export function nextBusinessDays(date: string, count: number, holidays: ReadonlySet<string> = new Set()): string[] {
  const off = holidayDays(holidays);
  const out: string[] = [];
  let day = dayNumber(date);
  while (out.length < count) {
    day++;
    if (isBusinessDayNumber(day, off)) out.push(fromDayNumber(day));
  }
  return out;
}

/** The first business day on or after `date`. */
export function nextBusinessDayOnOrAfter(date: string, holidays: ReadonlySet<string> = new Set()): string {
  const off = holidayDays(holidays);
  let day = dayNumber(date);
  while (!isBusinessDayNumber(day, off)) day++;
  return fromDayNumber(day);
}
