// Calendar quarters, as dates YYYY-MM-DD: where one starts and ends, which have ended, their label.

/** The first day of the quarter that ends on `quarterEnd`. */

export function quarterStart(quarterEnd: string): string {
  const month = Number(quarterEnd.slice(5, 7)) - 2;
  return `${quarterEnd.slice(0, 4)}-${String(month).padStart(2, "0")}-01`;
}

const QUARTER_ENDS = ["03-31", "06-30", "09-30", "12-31"] as const;

/** The end of the calendar quarter `date` (YYYY-MM-DD) falls in. */

export function quarterEndOf(date: string): string {
  return `${date.slice(0, 4)}-${QUARTER_ENDS[Math.ceil(Number(date.slice(5, 7)) / 3) - 1]}`;
}

/**
 * The last `count` calendar quarter ends that are over on `today` (YYYY-MM-DD; a quarter ends at
 * the close of its last day, so on 31 March itself Q1 is still open), newest first.
 */

export function endedQuarterEnds(today: string, count: number): string[] {
  const out: string[] = [];
  let year = Number(today.slice(0, 4));
  let q = QUARTER_ENDS.length - 1;
  while (out.length < count) {
    const end = `${year}-${QUARTER_ENDS[q]}`;
    if (end < today) out.push(end);
    if (q === 0) {
      q = QUARTER_ENDS.length - 1;
      year -= 1;
    } else q -= 1;
  }
  return out;
}

/** "Q3 2026" for 2026-09-30. */

export function quarterLabel(quarterEnd: string): string {
  return `Q${Math.ceil(Number(quarterEnd.slice(5, 7)) / 3)} ${quarterEnd.slice(0, 4)}`;
}
