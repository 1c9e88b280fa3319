// ESLint: Next.js's core-web-vitals and TypeScript rules. Prettier owns formatting (npm run lint
// runs both).
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: [
      ".next/**",
      ".next-test/**",
      ".next-h*/**",
      ".data/**",
      "node_modules/**",
      "db/migrations/**",
      "next-env.d.ts",
      "docs/**",
    ],
  },
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    // Tests read loosely typed JSON answers.
    files: ["tests/**"],
    rules: { "@typescript-eslint/no-explicit-any": "off" },
  },
];

export default config;
