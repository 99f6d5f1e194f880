/**
 * "Waiting for me" (GET /api/queue): what the signed-in person has to do next, across every entity
 * and quarter, each with the path of the screen where it is done. Read from the stored rows; the
 * exceptions without an explanation come from the stored figures of each book (portfolio_figures).
 */
import { QueryTypes } from "sequelize";
import { sequelize } from "../../db/sequelize";
import type { SignedIn } from "../../kit/actor";
import { endedQuarterEnds, quarterEndOf, quarterLabel } from "../../../shared/backtest/quarters";
import { ENGINE_VERSION } from "../../../shared/backtest/version";
import type { QueueItem } from "../../../shared/schemas/queue";
import { noticeIsLate } from "../../../shared/backtest/notice-deadline";

const today = () => new Date().toISOString().slice(0, 10);
const q = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
  sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });

/** Client paths (src/config/paths.ts builds the same ones). */
const hrefs = {
  snapshot: (entity: string, id: number) =>
    `/quarters?entity=${encodeURIComponent(entity)}&snapshot=${encodeURIComponent(String(id))}`,
  quarters: (entity: string) => `/quarters?entity=${encodeURIComponent(entity)}`,
  exception: (portfolio: string, date: string) =>
    `/backtest/${encodeURIComponent(portfolio)}?exception=${encodeURIComponent(date)}`,
  findings: (entity: string) => `/data?entity=${encodeURIComponent(entity)}`,
  settings: (id: number) => `/waiting#settings-${id}`,
  users: () => "/admin/users",
  filing: (id: number) => `/filings?filing=${id}`,
  notice: (entity: string, id: number) => `/notices?entity=${encodeURIComponent(entity)}&notice=${id}`,
};

/** Open overshooting notices, drafted or not, soonest due first, with whether each is late. */
async function openNotices(drafted: boolean): Promise<QueueItem[]> {
  const rows = await q<{ id: number; entity: string; portfolio: string; date: string; due_on: string }>(
    `SELECT n.id, e.code AS entity, p.code AS portfolio, DATE_FORMAT(n.business_date, '%Y-%m-%d') AS date,
            DATE_FORMAT(n.due_on, '%Y-%m-%d') AS due_on
       FROM overshooting_notices n JOIN portfolios p ON p.id = n.portfolio_id JOIN entities e ON e.id = p.entity_id
      WHERE n.status = 'open' AND n.drafted_at IS ${drafted ? "NOT NULL" : "NULL"}
      ORDER BY n.due_on, n.business_date, n.id`,
  );
  return rows.map((n) => {
    const late = noticeIsLate({ status: "open", dueOn: n.due_on, sentOn: null }, today());
    return {
      kind: drafted ? ("notice_to_send" as const) : ("notice_to_draft" as const),
      entity: n.entity,
      title: `${late ? "Late: o" : "O"}vershooting notice of ${n.entity} for ${n.date} in ${n.portfolio} ${
        drafted ? "drafted, to send to the supervisor" : "to draft"
      } by ${n.due_on}`,
      href: hrefs.notice(n.entity, Number(n.id)),
      due: n.due_on,
    };
  });
}

/** How many ended quarters back an analyst is reminded of a quarter without a snapshot. */
const QUARTERS_LOOKED_BACK = 4;

interface SnapshotRow {
  id: number;
  entity: string;
  quarter_end: string;
  who: string | null;
}

async function snapshotsIn(status: "submitted" | "returned" | "approved"): Promise<SnapshotRow[]> {
  const who = status === "submitted" ? "s.submitted_by" : status === "approved" ? "s.approved_by" : "NULL";
  return q<SnapshotRow>(
    `SELECT s.id, e.code AS entity, DATE_FORMAT(s.quarter_end, '%Y-%m-%d') AS quarter_end, u.name AS who
       FROM snapshots s JOIN entities e ON e.id = s.entity_id LEFT JOIN users u ON u.id = ${who}
      WHERE s.status = :status ORDER BY s.quarter_end, e.code`,
    { status },
  );
}

async function croItems(): Promise<QueueItem[]> {
  const [submitted, exclusions, proposals, approved, notices] = await Promise.all([
    snapshotsIn("submitted"),
    q<{ entity: string; portfolio: string; date: string; who: string | null }>(
      `SELECT e.code AS entity, p.code AS portfolio, DATE_FORMAT(r.business_date, '%Y-%m-%d') AS date, u.name AS who
         FROM exception_reviews r JOIN portfolios p ON p.id = r.portfolio_id JOIN entities e ON e.id = p.entity_id
         LEFT JOIN users u ON u.id = r.reviewed_by
        WHERE r.exclusion_status = 'requested' ORDER BY r.business_date, p.code`,
    ),
    q<{ id: number; entity: string; effective_from: string; reference: string; who: string | null }>(
      `SELECT s.id, e.code AS entity, DATE_FORMAT(s.effective_from, '%Y-%m-%d') AS effective_from, s.reference,
              u.name AS who
         FROM supervisory_settings s JOIN entities e ON e.id = s.entity_id LEFT JOIN users u ON u.id = s.proposed_by
        WHERE s.status = 'proposed' ORDER BY s.proposed_at, s.id`,
    ),
    snapshotsIn("approved"),
    openNotices(true),
  ]);
  return [
    ...notices,
    ...submitted.map((s) => ({
      kind: "snapshot_submitted" as const,
      entity: s.entity,
      title: `${quarterLabel(s.quarter_end)} of ${s.entity} submitted for sign-off${s.who ? ` by ${s.who}` : ""}`,
      href: hrefs.snapshot(s.entity, Number(s.id)),
    })),
    ...exclusions.map((r) => ({
      kind: "exclusion_request" as const,
      entity: r.entity,
      title: `Exclusion of the exception on ${r.date} in ${r.portfolio} requested${r.who ? ` by ${r.who}` : ""}`,
      href: hrefs.exception(r.portfolio, r.date),
    })),
    ...proposals.map((s) => ({
      kind: "settings_proposal" as const,
      entity: s.entity,
      title: `Settings of ${s.entity} from ${s.effective_from} proposed${s.who ? ` by ${s.who}` : ""} (${s.reference})`,
      href: hrefs.settings(Number(s.id)),
    })),
    ...approved.map((s) => ({
      kind: "approved_not_filed" as const,
      entity: s.entity,
      title: `${quarterLabel(s.quarter_end)} of ${s.entity} approved, not yet filed with the supervisor`,
      href: hrefs.snapshot(s.entity, Number(s.id)),
    })),
  ];
}

interface ExceptionDay {
  date: string;
  actual: boolean;
  hypothetical: boolean;
  excluded: boolean;
}

/** Counted exception days of each book's current window that nobody has explained yet. */
async function unexplainedExceptions(): Promise<QueueItem[]> {
  const rows = await q<{ pid: number; entity: string; portfolio: string; days: string | ExceptionDay[] | null }>(
    `SELECT p.id AS pid, e.code AS entity, p.code AS portfolio,
            JSON_EXTRACT(f.backtest_json, '$.exceptionDays') AS days
       FROM portfolio_figures f JOIN portfolios p ON p.id = f.portfolio_id JOIN entities e ON e.id = p.entity_id
      WHERE f.engine_version = :engine AND f.backtest_json IS NOT NULL
      ORDER BY e.code, p.code`,
    { engine: ENGINE_VERSION },
  );
  const reviewed = await q<{ pid: number; date: string }>(
    `SELECT portfolio_id AS pid, DATE_FORMAT(business_date, '%Y-%m-%d') AS date FROM exception_reviews`,
  );
  const done = new Set(reviewed.map((r) => `${Number(r.pid)}|${r.date}`));
  const out: QueueItem[] = [];
  for (const r of rows) {
    // The driver hands a JSON result over parsed or as text, depending on the column's type.
    const days = typeof r.days === "string" ? (JSON.parse(r.days) as ExceptionDay[]) : (r.days ?? []);
    for (const d of days) {
      if (!(d.actual || d.hypothetical) || d.excluded || done.has(`${Number(r.pid)}|${d.date}`)) continue;
      out.push({
        kind: "unexplained_exception",
        entity: r.entity,
        title: `Exception on ${d.date} in ${r.portfolio} has no explanation yet`,
        href: hrefs.exception(r.portfolio, d.date),
      });
    }
  }
  return out;
}

/** The last few ended quarters of each entity with data that have no snapshot at all. */
async function quartersWithoutSnapshot(): Promise<QueueItem[]> {
  const [firstDays, snapshots] = await Promise.all([
    q<{ entity: string; first: string }>(
      `SELECT e.code AS entity, DATE_FORMAT(MIN(f.first_day), '%Y-%m-%d') AS first
         FROM (SELECT portfolio_id, MIN(business_date) AS first_day FROM observations GROUP BY portfolio_id) f
         JOIN portfolios p ON p.id = f.portfolio_id JOIN entities e ON e.id = p.entity_id
        GROUP BY e.code ORDER BY e.code`,
    ),
    q<{ entity: string; quarter_end: string }>(
      `SELECT e.code AS entity, DATE_FORMAT(s.quarter_end, '%Y-%m-%d') AS quarter_end
         FROM snapshots s JOIN entities e ON e.id = s.entity_id`,
    ),
  ]);
  const has = new Set(snapshots.map((s) => `${s.entity}|${s.quarter_end}`));
  const ended = endedQuarterEnds(today(), QUARTERS_LOOKED_BACK).reverse();
  const out: QueueItem[] = [];
  for (const e of firstDays) {
    for (const end of ended) {
      if (end < quarterEndOf(e.first) || has.has(`${e.entity}|${end}`)) continue;
      out.push({
        kind: "quarter_without_snapshot",
        entity: e.entity,
        title: `${quarterLabel(end)} of ${e.entity} has ended and has no snapshot yet`,
        href: hrefs.quarters(e.entity),
      });
    }
  }
  return out;
}

/**
 * Filed snapshots a restatement flagged that no amendment corrects yet (docs/api.md#amendments): a
 * snapshot that has an amendment, whatever its status, is no longer waiting for one.
 */
async function amendmentsToPrepare(): Promise<SnapshotRow[]> {
  return q<SnapshotRow>(
    `SELECT s.id, e.code AS entity, DATE_FORMAT(s.quarter_end, '%Y-%m-%d') AS quarter_end, NULL AS who
       FROM snapshots s JOIN entities e ON e.id = s.entity_id
      WHERE s.status = 'filed' AND s.restated_at IS NOT NULL
        AND NOT EXISTS (SELECT 1 FROM snapshots a WHERE a.amends_id = s.id)
      ORDER BY s.quarter_end, e.code`,
  );
}

async function analystItems(): Promise<QueueItem[]> {
  const [notices, returned, toAmend, unexplained, findings, quarters] = await Promise.all([
    openNotices(false),
    snapshotsIn("returned"),
    amendmentsToPrepare(),
    unexplainedExceptions(),
    q<{ entity: string; portfolio: string; kind: string; date_from: string; date_to: string }>(
      `SELECT e.code AS entity, p.code AS portfolio, f.kind, DATE_FORMAT(f.date_from, '%Y-%m-%d') AS date_from,
              DATE_FORMAT(f.date_to, '%Y-%m-%d') AS date_to
         FROM data_findings f JOIN portfolios p ON p.id = f.portfolio_id JOIN entities e ON e.id = p.entity_id
        WHERE f.status = 'open' ORDER BY f.date_from, p.code, f.id`,
    ),
    quartersWithoutSnapshot(),
  ]);
  const findingWords: Record<string, string> = {
    missing_day: "missing day",
    stale_var: "stale VaR",
    pnl_without_var: "P&L without VaR",
    var_without_pnl: "VaR without P&L",
    outlier: "outlier",
  };
  return [
    ...notices,
    ...returned.map((s) => ({
      kind: "snapshot_returned" as const,
      entity: s.entity,
      title: `${quarterLabel(s.quarter_end)} of ${s.entity} was returned: prepare it again`,
      href: hrefs.snapshot(s.entity, Number(s.id)),
    })),
    ...toAmend.map((s) => ({
      kind: "amendment_to_prepare" as const,
      entity: s.entity,
      title: `${quarterLabel(s.quarter_end)} of ${s.entity} is filed and a day inside it was restated: prepare an amendment`,
      href: hrefs.snapshot(s.entity, Number(s.id)),
    })),
    ...unexplained,
    ...findings.map((f) => ({
      kind: "open_finding" as const,
      entity: f.entity,
      title: `Open finding in ${f.portfolio}: ${findingWords[f.kind] ?? f.kind}, ${
        f.date_from === f.date_to ? f.date_from : `${f.date_from} to ${f.date_to}`
      }`,
      href: hrefs.findings(f.entity),
    })),
    ...quarters,
  ];
}

const ROLE_WORDS: Record<string, string> = {
  analyst: "an analyst",
  cro: "a chief risk officer",
  treasury: "treasury",
  regulator: "a regulator",
  admin: "an administrator",
};

async function adminItems(actor: SignedIn): Promise<QueueItem[]> {
  const rows = await q<{ name: string; to_role: string; who: string | null }>(
    `SELECT r.name, r.to_role, u.name AS who FROM role_requests r LEFT JOIN users u ON u.id = r.proposed_by
      WHERE r.status = 'pending' AND r.proposed_by <> :me ORDER BY r.proposed_at, r.id`,
    { me: actor.user.id },
  );
  return rows.map((r) => ({
    kind: "role_request" as const,
    entity: "",
    title: `${r.name} to become ${ROLE_WORDS[r.to_role] ?? r.to_role}: proposed${r.who ? ` by ${r.who}` : ""}, waiting for a second administrator`,
    href: hrefs.users(),
  }));
}

async function regulatorItems(actor: SignedIn): Promise<QueueItem[]> {
  const rows = await q<{ id: number; entity: string; quarter_end: string }>(
    `SELECT f.id, e.code AS entity, DATE_FORMAT(s.quarter_end, '%Y-%m-%d') AS quarter_end
       FROM filings f JOIN snapshots s ON s.id = f.snapshot_id JOIN entities e ON e.id = s.entity_id
       JOIN regulator_assignments a ON a.entity_id = e.id AND a.user_id = :me
      WHERE f.acknowledged_at IS NULL AND f.sent_at IS NOT NULL ORDER BY s.quarter_end, e.code`,
    { me: actor.user.id },
  );
  return rows.map((r) => ({
    kind: "filing_to_acknowledge" as const,
    entity: r.entity,
    title: `${quarterLabel(r.quarter_end)} pack of ${r.entity} filed with you: check it and acknowledge receipt`,
    href: hrefs.filing(Number(r.id)),
  }));
}

/** The signed-in person's waiting items; a role with nothing to wait for (treasury) gets none. */
export async function listQueue(actor: SignedIn): Promise<QueueItem[]> {
  switch (actor.user.role) {
    case "cro":
      return croItems();
    case "analyst":
      return analystItems();
    case "admin":
      return adminItems(actor);
    case "regulator":
      return regulatorItems(actor);
    default:
      return [];
  }
}
