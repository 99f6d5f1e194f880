/**
 * The rows of a stored rolling series between two dates, cut from its text. The series is stored
 * as `JSON.stringify` of flat rows in date order, each starting with its date (`{"date":"…",`), so
 * the cut finds the first and last row in range by that mark and never parses the whole history:
 * a year of a six-year book costs what it costs on a one-year book. The answer is byte for byte
 * `JSON.stringify` of the parsed rows filtered by date (tests/server/rolling-slice.test.ts).
 */
const MARK = '{"date":"';

export function rollingRowsBetween(json: string, from?: string, to?: string): string {
  let start = -1;
  let end = -1;
  for (let i = json.indexOf(MARK); i >= 0; i = json.indexOf(MARK, i + MARK.length)) {
    const date = json.slice(i + MARK.length, i + MARK.length + 10);
    if (from !== undefined && date < from) continue;
    if (to !== undefined && date > to) break;
    if (start < 0) start = i;
    end = json.indexOf("}", i) + 1;
  }
  return start < 0 ? "[]" : `[${json.slice(start, end)}]`;
}
