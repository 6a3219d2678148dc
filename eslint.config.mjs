import tseslint from "typescript-eslint";
import layers from "./eslint-rules/layers.mjs";

export default tseslint.config(
  { ignores: ["node_modules/**", ".next/**", "reports/**", "test-results/**", "data/**", "next-env.d.ts"] },
  ...tseslint.configs.recommended,
  {
    plugins: { cpet: { rules: { layers } } },
    rules: {
      "cpet/layers": "error",
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    files: ["lib/**/*.ts"],
    ignores: ["lib/store/**", "lib/report/pdf/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["node:*", "fs", "path", "better-sqlite3"],
              message: "lib/ is pure: I/O belongs in lib/store, lib/report/pdf, cli/ or app/",
            },
          ],
        },
      ],
    },
  },
);
