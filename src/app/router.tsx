import type { ComponentType } from "react";
import { createBrowserRouter, type LoaderFunction, type RouteObject } from "react-router-dom";
import type { QueryClient } from "@tanstack/react-query";
import { paths, type PathKey } from "@/config/paths";
import { requireUser } from "./require-user";
import { RoleGate } from "./role-gate";
import { RouteErrorBoundary } from "./route-error";

type RouteModule = {
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
  default: ComponentType;
  ErrorBoundary?: ComponentType;
};

/**
 * A lazily loaded screen. For a path with roles, the loader first makes sure someone is signed in
 * (else: sign-in, remembering the way back) and fetches the screen's data only for a permitted role;
 * the component shows "not available for your role" to everyone else.
 */
function screen(
  queryClient: QueryClient,
  key: PathKey | null,
  load: () => Promise<RouteModule>,
): Pick<RouteObject, "lazy"> {
  return {
    lazy: async () => {
      const m = await load();
      const roles = key ? paths[key].roles : null;
      const Screen = m.default;
      const loader: LoaderFunction = async (args) => {
        if (roles) {
          const user = await requireUser(queryClient, args.request);
          if (!roles.includes(user.role)) return null;
        }
        return m.clientLoader ? m.clientLoader(queryClient)(args) : null;
      };
      const Component = roles
        ? () => (
            <RoleGate roles={roles}>
              <Screen />
            </RoleGate>
          )
        : Screen;
      return { loader, Component, ErrorBoundary: m.ErrorBoundary ?? RouteErrorBoundary };
    },
  };
}

function Starting() {
  return <p className="p-6 text-sm text-ink-muted">Opening Quartermark…</p>;
}

const relative = (p: string) => p.replace(/^\//, "");

export function createRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      HydrateFallback: Starting,
      ErrorBoundary: RouteErrorBoundary,
      children: [
        { path: paths.signIn.path, ...screen(queryClient, null, () => import("./routes/sign-in")) },
        { path: paths.setPassword.path, ...screen(queryClient, null, () => import("./routes/set-password")) },
        {
          id: "app",
          ...screen(queryClient, null, () => import("./routes/app-layout")),
          children: [
            { index: true, ...screen(queryClient, "overview", () => import("./routes/overview")) },
            {
              path: relative(paths.backtestIndex.path),
              ...screen(queryClient, "backtestIndex", () => import("./routes/backtest/index")),
            },
            {
              path: relative(paths.backtest.path),
              ...screen(queryClient, "backtest", () => import("./routes/backtest/portfolio")),
            },
            {
              path: relative(paths.waiting.path),
              ...screen(queryClient, "waiting", () => import("./routes/waiting")),
            },
            { path: relative(paths.data.path), ...screen(queryClient, "data", () => import("./routes/data")) },
            {
              path: relative(paths.settings.path),
              ...screen(queryClient, "settings", () => import("./routes/settings")),
            },
            {
              path: relative(paths.snapshots.path),
              ...screen(queryClient, "snapshots", () => import("./routes/snapshots")),
            },
            { path: relative(paths.capital.path), ...screen(queryClient, "capital", () => import("./routes/capital")) },
            { path: relative(paths.filings.path), ...screen(queryClient, "filings", () => import("./routes/filings")) },
            { path: relative(paths.notices.path), ...screen(queryClient, "notices", () => import("./routes/notices")) },
            { path: relative(paths.account.path), ...screen(queryClient, "account", () => import("./routes/account")) },
            { path: relative(paths.tokens.path), ...screen(queryClient, "tokens", () => import("./routes/tokens")) },
            {
              path: relative(paths.adminUsers.path),
              ...screen(queryClient, "adminUsers", () => import("./routes/admin/users")),
            },
            {
              path: relative(paths.adminEntities.path),
              ...screen(queryClient, "adminEntities", () => import("./routes/admin/entities")),
            },
            {
              path: relative(paths.adminEntity.path),
              ...screen(queryClient, "adminEntity", () => import("./routes/admin/entity")),
            },
            {
              path: relative(paths.adminAssignments.path),
              ...screen(queryClient, "adminAssignments", () => import("./routes/admin/assignments")),
            },
            {
              path: relative(paths.adminAudit.path),
              ...screen(queryClient, "adminAudit", () => import("./routes/admin/audit")),
            },
            {
              path: relative(paths.adminOutbox.path),
              ...screen(queryClient, "adminOutbox", () => import("./routes/admin/outbox")),
            },
            { path: "*", ...screen(queryClient, null, () => import("./routes/not-found")) },
          ],
        },
      ],
    },
  ];
}

export function createAppRouter(queryClient: QueryClient) {
  return createBrowserRouter(createRoutes(queryClient));
}
