import { queryOptions, useMutation, useQueryClient } from "@tanstack/react-query";
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

const base = (code: string) => `/api/entities/${encodeURIComponent(code)}`;

export const entityQueries = {
  root: () => ["entities"] as const,
  all: () =>
    queryOptions({
      queryKey: [...entityQueries.root(), "list"] as const,
      queryFn: () => api.get("/api/entities", entityListSchema),
    }),
  portfolios: (code: string) =>
    queryOptions({
      queryKey: [...entityQueries.root(), "detail", code, "portfolios"] as const,
      queryFn: () => api.get(`${base(code)}/portfolios`, portfolioListSchema),
    }),
  holidays: (code: string) =>
    queryOptions({
      queryKey: [...entityQueries.root(), "detail", code, "holidays"] as const,
      queryFn: () => api.get(`${base(code)}/holidays`, holidayListSchema),
    }),
};

export function useCreateEntity() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateEntityBody) => api.post("/api/entities", body, entitySchema),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: entityQueries.all().queryKey }),
  });
}

export function useUpdateEntity(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateEntityBody) => api.patch(base(code), body, entitySchema),
    // Rule set, basis and addend move the entity's zone, multiplier and capital everywhere.
    onSuccess: () => queryClient.invalidateQueries(everyFigure),
  });
}

export function useCreatePortfolio(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreatePortfolioBody) => api.post(`${base(code)}/portfolios`, body, portfolioSchema),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: entityQueries.portfolios(code).queryKey }),
  });
}

export function useRenamePortfolio(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ portfolio, name }: { portfolio: string; name: string }) =>
      api.patch(`${base(code)}/portfolios/${encodeURIComponent(portfolio)}`, { name }, portfolioSchema),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: entityQueries.portfolios(code).queryKey }),
  });
}

export function useAddHoliday(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateHolidayBody) => api.post(`${base(code)}/holidays`, body, holidaySchema),
    // A calendar change moves roll-off dates and data-quality findings too.
    onSuccess: () => queryClient.invalidateQueries(everyFigure),
  });
}

export function useRemoveHoliday(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (date: string) => api.del(`${base(code)}/holidays/${encodeURIComponent(date)}`),
    onSuccess: () => queryClient.invalidateQueries(everyFigure),
  });
}

/** What importing a year of the library's public holidays would change (read on demand, never cached). */
export function useHolidayImportPreview(code: string) {
  return useMutation({
    mutationFn: (year: number) =>
      api.get(withQuery(`${base(code)}/holiday-import`, { year }), holidayImportPreviewSchema),
  });
}

export function useImportHolidays(code: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: HolidayImportBody) => api.post(`${base(code)}/holiday-import`, body, holidayImportPreviewSchema),
    // Like a holiday added by hand: windows, roll-off dates and findings move.
    onSuccess: () => queryClient.invalidateQueries(everyFigure),
  });
}
