import type { Role } from "@shared/schemas/common";

export const allRoles: readonly Role[] = ["analyst", "cro", "treasury", "regulator", "admin"];
const adminOnly: readonly Role[] = ["admin"];
const dataReaders: readonly Role[] = ["analyst", "cro"];
/** Treasury reads the signed-off quarters too (the server sends them only approved and filed ones). */
const quarterReaders: readonly Role[] = ["analyst", "cro", "treasury"];
/** Treasury plans capital on these figures; analysts and the CRO read them beside the close. */
const capitalReaders: readonly Role[] = ["analyst", "cro", "treasury"];
/** The supervisor's settings: an admin proposes, a CRO approves; analysts and treasury read them (the server's policy). */
const settingsReaders: readonly Role[] = ["admin", "cro", "analyst", "treasury"];
/** Supervisors read the packs filed with them; the reporting office follows what was sent and acknowledged. */
const filingReaders: readonly Role[] = ["analyst", "cro", "regulator"];
/**
 * Treasury creates personal API tokens for its scripts (docs/architecture.md#roles); the server's
 * policy holds the same rule.
 */
const tokenHolders: readonly Role[] = ["treasury"];
/** Everyone whose work waits on others' (treasury plans on what is signed off; nothing waits for it). */
const queueHolders: readonly Role[] = ["analyst", "cro", "admin", "regulator"];

/** `path` with each given value as a search parameter, in the order given; empty ones are left out. */
function withParams(path: string, params: Record<string, string | number | undefined>): string {
  const s = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) if (value) s.set(key, String(value));
  const qs = s.toString();
  return qs ? `${path}?${qs}` : path;
}

export type AppPath = {
  /** The route pattern as React Router reads it. */
  readonly path: string;
  /** Who may open it; `null` means anyone, signed in or not. */
  readonly roles: readonly Role[] | null;
  /** Short label for navigation and page titles. */
  readonly label: string;
};

/** Every URL of the client, in one table. Build links with the `href` helpers, never by hand. */
export const paths = {
  signIn: {
    path: "/sign-in",
    roles: null,
    label: "Sign in",
    href: (redirectTo?: string) =>
      redirectTo && redirectTo !== "/" ? `/sign-in?redirectTo=${encodeURIComponent(redirectTo)}` : "/sign-in",
  },
  /** A set-password link from an e-mail (invitation or reset): the token rides in the fragment. */
  setPassword: { path: "/set-password", roles: null, label: "Set your password", href: () => "/set-password" },
  overview: { path: "/", roles: allRoles, label: "Overview", href: () => "/" },
  /** "Waiting for me": one's open work across every entity and quarter, each item linking to where it is done. */
  waiting: { path: "/waiting", roles: queueHolders, label: "Waiting for me", href: () => "/waiting" },
  /** One's own account: change one's own password. */
  account: { path: "/account", roles: allRoles, label: "Your account", href: () => "/account" },
  data: {
    path: "/data",
    roles: dataReaders,
    label: "Data",
    /** `upload` opens that upload's preview; findings default to open ones, `status: "all"` shows every status. */
    href: (q?: { upload?: number; entity?: string; status?: "open" | "resolved" | "explained" | "all" }) =>
      withParams("/data", {
        upload: q?.upload,
        entity: q?.entity,
        status: q?.status === "open" ? undefined : q?.status,
      }),
  },
  backtestIndex: { path: "/backtest", roles: dataReaders, label: "Backtest", href: () => "/backtest" },
  backtest: {
    path: "/backtest/:portfolio",
    roles: dataReaders,
    label: "Backtest",
    /** `asOf` (YYYY-MM-DD) backtests an earlier date; `exception` opens that exception's review. */
    href: (portfolio: string, q?: { asOf?: string; exception?: string }) =>
      withParams(`/backtest/${encodeURIComponent(portfolio)}`, { asOf: q?.asOf, exception: q?.exception }),
  },
  snapshots: {
    path: "/quarters",
    roles: quarterReaders,
    label: "Quarter close",
    /** `snapshot` opens that snapshot; without `entity` the screen starts on the first entity. */
    href: (q?: { entity?: string; snapshot?: number }) =>
      withParams("/quarters", { entity: q?.entity, snapshot: q?.snapshot }),
  },
  capital: {
    path: "/capital",
    roles: capitalReaders,
    label: "Capital",
    /** Without `entity` the screen starts on the first entity; without `date` the forecast is for the server's default (the current quarter end). */
    href: (q?: { entity?: string; date?: string }) => withParams("/capital", { entity: q?.entity, date: q?.date }),
  },
  settings: {
    path: "/settings",
    roles: settingsReaders,
    label: "Supervisory settings",
    /** Without `entity` the screen starts on the first entity. */
    href: (q?: { entity?: string }) => (q?.entity ? `/settings?entity=${encodeURIComponent(q.entity)}` : "/settings"),
  },
  filings: {
    path: "/filings",
    roles: filingReaders,
    label: "Filings",
    /** `filing` opens that filing; without it the screen opens the newest one. */
    href: (q?: { filing?: number }) => (q?.filing ? `/filings?filing=${q.filing}` : "/filings"),
  },
  /** Overshooting notices of the EU entities: the analyst drafts, the CRO sends (the server's policy). */
  notices: {
    path: "/notices",
    roles: dataReaders,
    label: "Notices",
    /** Without `entity` the screen starts on the first EU entity; `notice` opens that notice. */
    href: (q?: { entity?: string; notice?: number }) =>
      withParams("/notices", { entity: q?.entity, notice: q?.notice }),
  },
  tokens: { path: "/tokens", roles: tokenHolders, label: "API tokens", href: () => "/tokens" },
  adminUsers: { path: "/admin/users", roles: adminOnly, label: "Users", href: () => "/admin/users" },
  adminEntities: { path: "/admin/entities", roles: adminOnly, label: "Entities", href: () => "/admin/entities" },
  adminEntity: {
    path: "/admin/entities/:code",
    roles: adminOnly,
    label: "Entity",
    href: (code: string) => `/admin/entities/${encodeURIComponent(code)}`,
  },
  adminAssignments: {
    path: "/admin/assignments",
    roles: adminOnly,
    label: "Regulator access",
    href: () => "/admin/assignments",
  },
  adminAudit: {
    path: "/admin/audit",
    roles: adminOnly,
    label: "Audit log",
    href: (q?: { action?: string; actor?: string; from?: string; to?: string; page?: number }) =>
      withParams("/admin/audit", {
        action: q?.action,
        actor: q?.actor,
        from: q?.from,
        to: q?.to,
        page: q?.page && q.page > 1 ? q.page : undefined,
      }),
  },
  /** The development mail outbox: what the local mail sink kept (the server refuses it in production). */
  adminOutbox: {
    path: "/admin/outbox",
    roles: adminOnly,
    label: "Outbox",
    /** `message` opens that message; without it the screen opens the newest one. */
    href: (q?: { message?: string }) =>
      q?.message ? `/admin/outbox?message=${encodeURIComponent(q.message)}` : "/admin/outbox",
  },
} as const satisfies Record<string, AppPath & { href: (...args: never[]) => string }>;

export type PathKey = keyof typeof paths;

/** Navigation entries in display order; each shows only for the roles of its path. */
export const navigation: readonly { key: PathKey; group: "main" | "admin" }[] = [
  { key: "overview", group: "main" },
  { key: "waiting", group: "main" },
  { key: "backtestIndex", group: "main" },
  { key: "data", group: "main" },
  { key: "snapshots", group: "main" },
  { key: "capital", group: "main" },
  { key: "settings", group: "main" },
  { key: "filings", group: "main" },
  { key: "notices", group: "main" },
  { key: "tokens", group: "main" },
  { key: "adminUsers", group: "admin" },
  { key: "adminEntities", group: "admin" },
  { key: "adminAssignments", group: "admin" },
  { key: "adminAudit", group: "admin" },
  { key: "adminOutbox", group: "admin" },
];

export function mayOpen(key: PathKey, role: Role | undefined): boolean {
  const roles = paths[key].roles;
  if (roles === null) return true;
  return role !== undefined && roles.includes(role);
}

/** Only same-site paths are followed after sign-in (no `//host` or absolute URLs). */
export function safeRedirect(target: string | null | undefined): string {
  if (!target || !target.startsWith("/") || target.startsWith("//") || target.startsWith("/\\")) return "/";
  if (target.startsWith(paths.signIn.path) || target.startsWith(paths.setPassword.path)) return "/";
  return target;
}
