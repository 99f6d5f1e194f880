import { useMutation } from "@tanstack/react-query";
import {
  entityListSchema,
  entitySchema,
  holidayImportPreviewSchema,
  holidayListSchema,
  holidaySchema,
  portfolioListSchema,
  portfolioSchema,
  type CreateEntityBody,
  type CreateHolidayBody,
  type CreatePortfolioBody,
  type HolidayImportBody,
  type UpdateEntityBody,
} from "@shared/schemas/entity";
import { everyFigure } from "@/lib/query-scope";
import { api, withQuery } from "@/lib/api-client";
import { getQuery, useRefreshingMutation } from "@/lib/queries";

const base = (code: string) => `/api/entities/${encodeURIComponent(code)}`;

export const entityQueries = {
  root: () => ["entities"] as const,
  all: () => getQuery([...entityQueries.root(), "list"], "/api/entities", entityListSchema),
  portfolios: (code: string) =>
    getQuery([...entityQueries.root(), "detail", code, "portfolios"], `${base(code)}/portfolios`, portfolioListSchema),
  holidays: (code: string) =>
    getQuery([...entityQueries.root(), "detail", code, "holidays"], `${base(code)}/holidays`, holidayListSchema),
};

export function useCreateEntity() {
  return useRefreshingMutation((body: CreateEntityBody) => api.post("/api/entities", body, entitySchema), {
    queryKey: entityQueries.all().queryKey,
  });
}

export function useUpdateEntity(code: string) {
  // Rule set, basis and addend move the entity's zone, multiplier and capital everywhere.
  return useRefreshingMutation((body: UpdateEntityBody) => api.patch(base(code), body, entitySchema), everyFigure);
}

export function useCreatePortfolio(code: string) {
  return useRefreshingMutation(
    (body: CreatePortfolioBody) => api.post(`${base(code)}/portfolios`, body, portfolioSchema),
    { queryKey: entityQueries.portfolios(code).queryKey },
  );
}

export function useRenamePortfolio(code: string) {
  return useRefreshingMutation(
    ({ portfolio, name }: { portfolio: string; name: string }) =>
      api.patch(`${base(code)}/portfolios/${encodeURIComponent(portfolio)}`, { name }, portfolioSchema),
    { queryKey: entityQueries.portfolios(code).queryKey },
  );
}

export function useAddHoliday(code: string) {
  // A calendar change moves roll-off dates and data-quality findings too.
  return useRefreshingMutation(
    (body: CreateHolidayBody) => api.post(`${base(code)}/holidays`, body, holidaySchema),
    everyFigure,
  );
}

export function useRemoveHoliday(code: string) {
  return useRefreshingMutation(
    (date: string) => api.del(`${base(code)}/holidays/${encodeURIComponent(date)}`),
    everyFigure,
  );
}

/** What importing a year of the library's public holidays would change (read on demand, never cached). */
export function useHolidayImportPreview(code: string) {
  return useMutation({
    mutationFn: (year: number) =>
      api.get(withQuery(`${base(code)}/holiday-import`, { year }), holidayImportPreviewSchema),
  });
}

export function useImportHolidays(code: string) {
  // Like a holiday added by hand: windows, roll-off dates and findings move.
  return useRefreshingMutation(
    (body: HolidayImportBody) => api.post(`${base(code)}/holiday-import`, body, holidayImportPreviewSchema),
    everyFigure,
  );
}
