import js from "@eslint/js";
import tseslint from "typescript-eslint";
import importX, { createNodeResolver } from "eslint-plugin-import-x";
import globals from "globals";
import { readdirSync } from "node:fs";

// Each client feature stands alone: it may import shared/, src/lib and src/components, never another
// feature (the screens in src/app compose them). One zone per folder under src/features.
const featureZones = readdirSync(new URL("./src/features", import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => ({
    target: `./src/features/${d.name}`,
    from: "./src/features",
    except: [`./${d.name}`],
    message: "features do not import one another; compose them in src/app or move the shared piece to src/lib",
  }));

// Lint holds the architecture: shared/ imports nothing of ours; server/ and src/ only meet in shared/.
export default tseslint.config(
  { ignores: ["dist/**", "node_modules/**", ".data/**", "coverage/**", "migrations/**", "**/*.cjs"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { "import-x": importX },
    // TypeScript files and the @/ and @shared/ paths of tsconfig.json, so the zones below see every import.
    settings: {
      "import-x/resolver-next": [
        createNodeResolver({
          extensions: [".ts", ".tsx", ".js", ".json"],
          tsconfig: { configFile: "./tsconfig.json" },
        }),
      ],
    },
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "import-x/no-restricted-paths": [
        "error",
        {
          zones: [
            {
              target: "./shared",
              from: ["./server", "./src", "./scripts", "./seeders", "./tests"],
              message: "shared/ is pure: it imports nothing of ours",
            },
            {
              target: "./src",
              from: ["./server", "./scripts", "./seeders"],
              message: "the client talks to the server only over HTTP",
            },
            { target: "./server", from: ["./src"], message: "the server never imports client code" },
            ...featureZones,
          ],
        },
      ],
      "no-restricted-syntax": [
        "error",
        {
          selector: "MemberExpression[object.name='process'][property.name='env']",
          message: "Read configuration through server/config.ts",
        },
      ],
    },
  },
  {
    files: ["server/config.ts", "scripts/**", "vite.config.ts", "bench/**", "tests/**", "seeders/**"],
    rules: { "no-restricted-syntax": "off" },
  },
);
