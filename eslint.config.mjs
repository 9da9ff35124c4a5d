// Lint that catches data bugs: type-aware TypeScript rules, no delete/update without where,
// and lib/rules kept pure.
import drizzle from "eslint-plugin-drizzle";
import tseslint from "typescript-eslint";

export default tseslint.config(
  { ignores: ["node_modules/**", ".next/**", ".next-*/**", ".data/**", ".data-*/**", "db/migrations/**", "next-env.d.ts", "scripts/*.mjs", "scripts/*.cjs", "eslint.config.mjs", "postcss.config.mjs"] },
  ...tseslint.configs.recommendedTypeChecked,
  {
    languageOptions: { parserOptions: { projectService: true, tsconfigRootDir: import.meta.dirname } },
    plugins: { drizzle },
    rules: {
      "drizzle/enforce-delete-with-where": ["error", { drizzleObjectName: ["db", "tx", "executor"] }],
      "drizzle/enforce-update-with-where": ["error", { drizzleObjectName: ["db", "tx", "executor"] }],
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "@typescript-eslint/no-misused-promises": ["error", { checksVoidReturn: { attributes: false } }],
      "@typescript-eslint/only-throw-error": "off",
    },
  },
  {
    files: ["lib/rules/**/*.ts"],
    rules: {
      "no-restricted-imports": ["error", { patterns: [{ group: ["@/*", "../*", "node:*", "react", "next", "next/*", "drizzle-orm", "drizzle-orm/*"], message: "lib/rules is pure: it imports only its own files." }] }],
      "no-restricted-syntax": ["error", { selector: "CallExpression[callee.object.name='Date'][callee.property.name='now']", message: "lib/rules never reads the clock: take today as an argument." }],
    },
  },
  {
    files: ["tests/**/*.ts", "bench/**/*.ts", "scripts/**/*.ts", "db/seed/**/*.ts"],
    rules: { "@typescript-eslint/no-unsafe-assignment": "off", "@typescript-eslint/no-unsafe-member-access": "off", "@typescript-eslint/no-unsafe-argument": "off", "@typescript-eslint/no-unsafe-call": "off", "@typescript-eslint/no-unsafe-return": "off" },
  },
);
