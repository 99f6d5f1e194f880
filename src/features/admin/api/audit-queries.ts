import { keepPreviousData, queryOptions } from "@tanstack/react-query";
import { auditPageSchema } from "@shared/schemas/audit";
import { api, withQuery } from "@/lib/api-client";

export const AUDIT_PAGE_SIZE = 50;

export type AuditPageParams = { page: number; action?: string };

export const auditQueries = {
  root: () => ["audit-events"] as const,
  page: ({ page, action }: AuditPageParams) =>
    queryOptions({
      queryKey: [...auditQueries.root(), "page", { page, action: action ?? "" }] as const,
      queryFn: () =>
        api.get(
          withQuery("/api/audit-events", { limit: AUDIT_PAGE_SIZE, offset: (page - 1) * AUDIT_PAGE_SIZE, action }),
          auditPageSchema,
        ),
      placeholderData: keepPreviousData,
      staleTime: 5_000,
    }),
};
