import type { Query } from "@tanstack/react-query";

/**
 * For mutations that can move any figure on any screen (committed daily data, an entity's rule
 * set, basis or addend, a calendar change): every cached query except who is signed in goes stale.
 * Features may not import each other's key factories, so this is the one shared rule.
 */
export const everyFigure = {
  predicate: (q: Query) => q.queryKey[0] !== "auth",
} as const;
