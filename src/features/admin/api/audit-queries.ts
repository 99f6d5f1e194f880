import { keepPreviousData } from "@tanstack/react-query";
import { auditPageSchema } from "@shared/schemas/audit";
import { withQuery } from "@/lib/api-client";
import { getQuery } from "@/lib/queries";

export const AUDIT_PAGE_SIZE = 50;

/** The audit log's filter: the action's start, part of the person's e-mail, a span of days (UTC). */
export type AuditFilter = { action?: string; actor?: string; from?: string; to?: string };
export type AuditPageParams = AuditFilter & { page: number };

export const auditQueries = {
  root: () => ["audit-events"] as const,
  page: ({ page, action, actor, from, to }: AuditPageParams) =>
    getQuery(
      [
        ...auditQueries.root(),
        "page",
        { page, action: action ?? "", actor: actor ?? "", from: from ?? "", to: to ?? "" },
      ],
      withQuery("/api/audit-events", {
        limit: AUDIT_PAGE_SIZE,
        offset: (page - 1) * AUDIT_PAGE_SIZE,
        action,
        actor,
        from,
        to,
      }),
      auditPageSchema,
      { placeholderData: keepPreviousData, staleTime: 5_000 },
    ),
};
