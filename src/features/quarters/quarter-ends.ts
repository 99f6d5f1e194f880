/** The calendar quarter ends, as MM-DD, in the order of the year. */
const QUARTER_ENDS = ["03-31", "06-30", "09-30", "12-31"] as const;

/**
 * The last `count` calendar quarter ends that are over on `today` (a quarter ends at the close of
 * its last day, so on 31 March itself Q1 is still open), newest first, as YYYY-MM-DD.
 * The date is read in UTC, as the office's timestamps are.
 */
export function endedQuarterEnds(today: Date, count = 8): string[] {
  const todayIso = today.toISOString().slice(0, 10);
  const out: string[] = [];
  let year = today.getUTCFullYear();
  let q = QUARTER_ENDS.length - 1;
  while (out.length < count) {
    const end = `${year}-${QUARTER_ENDS[q]}`;
    if (end < todayIso) out.push(end);
    if (q === 0) {
      q = QUARTER_ENDS.length - 1;
      year -= 1;
    } else q -= 1;
  }
  return out;
}
