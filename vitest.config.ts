import { defineConfig } from "vitest/config";
import react from "@vitejs/plugin-react";
import { fileURLToPath } from "node:url";

const alias = {
  "@shared": fileURLToPath(new URL("./shared", import.meta.url)),
  "@": fileURLToPath(new URL("./src", import.meta.url)),
};

// One runner, four projects mirroring the code: engine, API on real MariaDB, components, browser journeys.
export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: "shared",
          environment: "node",
          include: ["tests/shared/**/*.test.ts"],
          globals: true,
          testTimeout: 30000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "server",
          environment: "node",
          include: ["tests/server/**/*.test.ts"],
          globals: true,
          fileParallelism: false,
          testTimeout: 30000,
          hookTimeout: 60000,
        },
      },
      {
        plugins: [react()],
        resolve: { alias },
        test: {
          name: "client",
          environment: "jsdom",
          include: ["tests/client/**/*.test.tsx"],
          setupFiles: ["tests/client/setup.ts"],
          globals: true,
          testTimeout: 30000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "e2e",
          environment: "node",
          include: ["tests/e2e/**/*.test.ts"],
          globals: true,
          fileParallelism: false,
          testTimeout: 90000,
          hookTimeout: 180000,
        },
      },
    ],
  },
});
