import js from "@eslint/js";
import tseslint from "typescript-eslint";
import importX from "eslint-plugin-import-x";
import globals from "globals";

// Lint holds the architecture: shared/ imports nothing of ours; server/ and src/ only meet in shared/.
export default tseslint.config(
  { ignores: ["dist/**", "node_modules/**", ".data/**", "coverage/**", "migrations/**", "**/*.cjs"] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { "import-x": importX },
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
