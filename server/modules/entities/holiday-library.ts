import Holidays from "date-holidays";
import { CALENDAR_COUNTRIES, type CalendarCountry } from "../../../shared/schemas/entity";

/**
 * The public holidays of a jurisdiction from the date-holidays library (pinned in package.json; its rules are kept
 * by its maintainers against each country's official calendar). docs/rules.md#business-days says which days count:
 * only the library's type "public" (days offices and markets close by law), substitute days included (a public
 * holiday on a weekend moves to the weekday the law names); "bank", "optional", "school" and "observance" days
 * (Easter Sunday, Mother's Day, Christmas Eve in the United States) are not imported.
 *
 * The United Kingdom's calendar is England and Wales (subdivision ENG): the bank holidays a London office keeps,
 * with the Summer bank holiday on the last Monday of August. Other countries are their national holidays.
 */
const SUBDIVISION: Partial<Record<CalendarCountry, string>> = { GB: "ENG" };

export interface LibraryHoliday {
  date: string;
  name: string;
}

function weekday(date: string): boolean {
  const wd = new Date(`${date}T00:00:00Z`).getUTCDay();
  return wd !== 0 && wd !== 6;
}

/** The year's public holidays that fall on a weekday (a weekend is never a business day), one per date, by date. */
export function publicHolidays(country: CalendarCountry, year: number): LibraryHoliday[] {
  const state = SUBDIVISION[country];
  const library = new Holidays(state ? { country, state } : { country }, { languages: ["en"], types: ["public"] });
  const byDate = new Map<string, string[]>();
  for (const h of library.getHolidays(year, "en")) {
    if (h.type !== "public") continue;
    const date = h.date.slice(0, 10);
    if (!date.startsWith(`${year}-`) || !weekday(date)) continue;
    byDate.set(date, [...(byDate.get(date) ?? []), h.name]);
  }
  return [...byDate.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([date, names]) => ({ date, name: names.join(" / ").slice(0, 120) }));
}

export function countryName(country: string): string {
  return CALENDAR_COUNTRIES[country as CalendarCountry] ?? country;
}
