import type { Role } from "../../shared/schemas/common";
import { TOKEN_HOLDERS } from "../kit/roles";

/**
 * Who may call what: the single authority for access on the server. Every route the app
 * registers must appear here (registration throws otherwise), and the access tests walk this
 * table for every role.
 *   "public"    — no session needed
 *   "signed-in" — any active user
 *   Role[]      — only these roles
 */
export type Access = "public" | "signed-in" | readonly Role[];

const STAFF: readonly Role[] = ["analyst", "cro", "treasury", "admin"];
/** The reporting office: analysts prepare, the chief risk officer signs off. */
const OFFICE: readonly Role[] = ["analyst", "cro"];
/** The office and treasury, who plan capital with the figures. */
const OFFICE_AND_TREASURY: readonly Role[] = ["analyst", "cro", "treasury"];
/** The office and the supervisor's staff, who read the filings of their entities. */
const OFFICE_AND_REGULATOR: readonly Role[] = ["analyst", "cro", "regulator"];

export const POLICY = {
  "GET /api/health": "public",
  "POST /api/auth/login": "public",
  "POST /api/auth/logout": "signed-in",
  // Each person chooses the e-mails they receive (of those for their role).
  "GET /api/notifications/choices": "signed-in",
  "PUT /api/notifications/choices": "signed-in",
  "GET /api/auth/me": "signed-in",
  "GET /api/auth/session": "public",
  // Everyone changes their own password (current + new; other sessions end).
  "POST /api/auth/password": "signed-in",
  // A set-password link's holder, before they have a password: rate limited per address in the router.
  "POST /api/invitations/lookup": "public",
  "POST /api/invitations/accept": "public",

  // "Waiting for me": each person's own open work across every entity and quarter (by role, in the service).
  "GET /api/queue": "signed-in",

  // Entities: every role reads (a regulator only the entities assigned to them); admin changes.
  "GET /api/entities": "signed-in",
  "POST /api/entities": ["admin"],
  "PATCH /api/entities/:code": ["admin"],
  "GET /api/entities/:code/portfolios": STAFF,
  "POST /api/entities/:code/portfolios": ["admin"],
  "PATCH /api/entities/:code/portfolios/:portfolio": ["admin"],
  "GET /api/entities/:code/holidays": STAFF,
  "POST /api/entities/:code/holidays": ["admin"],
  "DELETE /api/entities/:code/holidays/:date": ["admin"],
  "GET /api/entities/:code/holiday-import": ["admin"],
  "POST /api/entities/:code/holiday-import": ["admin"],

  // Names by e-mail, so that every screen shows people by name (the records keep the e-mail).
  "GET /api/people": "signed-in",
  // Users, assignments and the audit log are the administrator's.
  "GET /api/users": ["admin"],
  "POST /api/users": ["admin"],
  "PATCH /api/users/:id": ["admin"],
  // An admin never sets a password: they send a one-time link (an invitation again, or a reset).
  "POST /api/users/:id/password-link": ["admin"],
  // An account locked out by failed sign-ins, unlocked by an administrator (audit-logged).
  "POST /api/users/:id/unlock": ["admin"],
  "GET /api/invitations": ["admin"],
  // Granting or removing the CRO or admin role: one admin proposes, another approves (in the service).
  "GET /api/role-requests": ["admin"],
  "POST /api/role-requests": ["admin"],
  "POST /api/role-requests/:id/approve": ["admin"],
  "POST /api/role-requests/:id/reject": ["admin"],
  "GET /api/regulator-assignments": ["admin"],
  "POST /api/regulator-assignments": ["admin"],
  "DELETE /api/regulator-assignments/:userId/:entityCode": ["admin"],
  "GET /api/audit-events": ["admin"],
  "GET /api/audit-events.:format": ["admin"],
  // The audit log's signatures and sequence: its keeper, and the CRO, whose sign-offs it records.
  // Not regulators (the log covers every entity); they check their filings through the filing verify.
  "GET /api/audit-events/verify": ["cro", "admin"],
  // The development mail outbox (404 in production, in the service): what the local sink received.
  "GET /api/admin/outbox": ["admin"],
  "GET /api/admin/outbox/:id": ["admin"],
  "GET /api/admin/outbox/:id/attachments/:index": ["admin"],

  // Daily data: analysts bring it in; the CRO reads it to understand the figures.
  "GET /api/uploads/template.csv": ["analyst", "cro", "admin"],
  "POST /api/uploads": ["analyst"],
  "GET /api/uploads": OFFICE,
  "GET /api/uploads.:format": OFFICE,
  "GET /api/uploads/:id": OFFICE,
  "GET /api/uploads/:id/rows": OFFICE,
  "POST /api/uploads/:id/commit": ["analyst"],
  "DELETE /api/uploads/:id": ["analyst"],
  "GET /api/portfolios/:code/observations": OFFICE,
  "GET /api/findings": OFFICE,
  "GET /api/findings.:format": OFFICE,
  "PUT /api/findings/:id": ["analyst"],

  // Quarter snapshots: analysts prepare and submit, the CRO approves or returns (four eyes in the
  // service); treasury reads signed-off snapshots only (filtered in the service).
  "GET /api/snapshots": OFFICE_AND_TREASURY,
  "GET /api/snapshots.:format": OFFICE_AND_TREASURY,
  "POST /api/snapshots": ["analyst"],
  "GET /api/snapshots/:id": OFFICE_AND_TREASURY,
  // The return data: read by whoever reads the snapshot; its analyst inputs entered before submitting.
  "GET /api/snapshots/:id/return": OFFICE_AND_TREASURY,
  "GET /api/snapshots/:id/return.:format": OFFICE_AND_TREASURY,
  "PUT /api/snapshots/:id/return-inputs": ["analyst"],
  "POST /api/snapshots/:id/submit": ["analyst"],
  "POST /api/snapshots/:id/approve": ["cro"],
  "POST /api/snapshots/:id/return": ["cro"],
  "GET /api/snapshots/:id/verify": OFFICE_AND_TREASURY,
  // The entity's whole signed chain: whoever may check one of its snapshots may check them all.
  "GET /api/entities/:code/chain/verify": OFFICE_AND_TREASURY,
  "GET /api/entities/:code/capital/history": OFFICE_AND_TREASURY,
  "GET /api/entities/:code/capital/history.:format": OFFICE_AND_TREASURY,
  // Packs and filings: the office reads packs, the CRO files; a regulator reads, acknowledges and
  // verifies the filings of the entities assigned to them (filtered in the service).
  "GET /api/snapshots/:id/pack.pdf": OFFICE,
  "POST /api/snapshots/:id/filings": ["cro"],
  // The CRO finishes a filing that did not reach every recipient (only those not yet accepted).
  "POST /api/filings/:id/deliver": ["cro"],
  "GET /api/filings": OFFICE_AND_REGULATOR,
  "GET /api/filings.:format": OFFICE_AND_REGULATOR,
  "GET /api/filings/:id/pack.pdf": OFFICE_AND_REGULATOR,
  "POST /api/filings/:id/acknowledge": ["regulator"],
  "GET /api/filings/:id/verify": OFFICE_AND_REGULATOR,
  // Forecasts and what-ifs on current data: treasury plans capital with them (docs/architecture.md#roles).
  "GET /api/entities/:code/capital/forecast": OFFICE_AND_TREASURY,
  "POST /api/entities/:code/capital/what-if": OFFICE_AND_TREASURY,

  // Determinations of the multiplier (treasury sees the signed-off ones, filtered in the service) and
  // capital on a date with the multiplier in force beside the indicative one (current figures).
  "GET /api/entities/:code/determinations": OFFICE_AND_TREASURY,
  "GET /api/entities/:code/determinations.:format": OFFICE_AND_TREASURY,
  "GET /api/entities/:code/capital": OFFICE,
  // Governed supervisory settings: everyone on staff reads them; an admin proposes a change and a CRO
  // approves or rejects it (four eyes in the service).
  "GET /api/entities/:code/settings": STAFF,
  "POST /api/entities/:code/settings": ["admin"],
  "POST /api/settings/:id/approve": ["cro"],
  "POST /api/settings/:id/reject": ["cro"],

  // Current (unapproved) figures, reviews and evidence: the reporting office and the CRO only.
  "GET /api/overview": OFFICE,
  "GET /api/portfolios/:code/backtest": OFFICE,
  "GET /api/portfolios/:code/rolling": OFFICE,
  "GET /api/portfolios/:code/rolling.:format": OFFICE,
  "GET /api/portfolios/:code/exceptions.:format": OFFICE,
  "PUT /api/portfolios/:code/exceptions/:date/review": ["analyst"],
  "PUT /api/portfolios/:code/exceptions/:date/decision": ["cro"],
  "POST /api/portfolios/:code/exceptions/:date/evidence": ["analyst"],
  "GET /api/evidence/:id": OFFICE,
  // Overshooting notices (EU): the office reads them; an analyst drafts the cause, the CRO sends it
  // to the supervisor (four eyes: the one who drafts is never the one who sends).
  "GET /api/notices": OFFICE,
  "PUT /api/notices/:id/draft": ["analyst"],
  "POST /api/notices/:id/send": ["cro"],
  "GET /api/notices/:id/notice.pdf": OFFICE,

  // Personal API tokens: each holder lists, creates and revokes their own (filtered in the service).
  "GET /api/tokens": TOKEN_HOLDERS,
  "POST /api/tokens": TOKEN_HOLDERS,
  "DELETE /api/tokens/:id": TOKEN_HOLDERS,
} as const satisfies Record<string, Access>;

export type RouteKey = keyof typeof POLICY;

/**
 * A request signed in with a personal API token reads only: every GET its owner's role allows, and
 * these computations that are POSTs only to carry their parameters and change nothing. Anything
 * else (tokens creating tokens included) needs a signed-in session.
 */
const READ_ONLY_POSTS: ReadonlySet<string> = new Set(["POST /api/entities/:code/capital/what-if"] satisfies RouteKey[]);

export function tokenMayCall(key: string): boolean {
  return key.startsWith("GET ") || READ_ONLY_POSTS.has(key);
}

export function accessFor(key: string): Access | undefined {
  return (POLICY as Record<string, Access>)[key];
}
