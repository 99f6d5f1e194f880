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
  /** The screen at a path of the table, below the signed-in layout. */
  const at = (key: PathKey, load: () => Promise<RouteModule>): RouteObject => ({
    path: relative(paths[key].path),
    ...screen(queryClient, key, load),
  });
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
            at("backtestIndex", () => import("./routes/backtest/index")),
            at("backtest", () => import("./routes/backtest/portfolio")),
            at("waiting", () => import("./routes/waiting")),
            at("data", () => import("./routes/data")),
            at("settings", () => import("./routes/settings")),
            at("snapshots", () => import("./routes/snapshots")),
            at("capital", () => import("./routes/capital")),
            at("filings", () => import("./routes/filings")),
            at("notices", () => import("./routes/notices")),
            at("account", () => import("./routes/account")),
            at("tokens", () => import("./routes/tokens")),
            at("adminUsers", () => import("./routes/admin/users")),
            at("adminEntities", () => import("./routes/admin/entities")),
            at("adminEntity", () => import("./routes/admin/entity")),
            at("adminAssignments", () => import("./routes/admin/assignments")),
            at("adminAudit", () => import("./routes/admin/audit")),
            at("adminOutbox", () => import("./routes/admin/outbox")),
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
