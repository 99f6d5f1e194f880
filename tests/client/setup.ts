import "@testing-library/jest-dom/vitest";
import { cleanup, configure } from "@testing-library/react";
import { afterEach, vi } from "vitest";

// Screens load lazily, as in the browser: on a busy two-core machine the first import of a route can
// take longer than the library's one-second default, so the wait for what a screen shows is longer.
configure({ asyncUtilTimeout: 8000 });

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});
