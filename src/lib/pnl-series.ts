/** Which P&L series breached VaR on the day (exception tables, reviews and roll-off calendars). */
export function seriesOf(day: { actual: boolean; hypothetical: boolean }): string {
  if (day.actual && day.hypothetical) return "Both";
  if (day.actual) return "Actual";
  if (day.hypothetical) return "Hypothetical";
  return "—";
}
