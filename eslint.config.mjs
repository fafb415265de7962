import next from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...next,
  ...nextTs,
  { ignores: [".next/**", "node_modules/**", "data/**", "public/**", "next-env.d.ts"] },
  {
    // The science library is pure: no framework, database or I/O imports.
    files: ["lib/science/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        { patterns: ["react", "react-*", "next", "next/*", "@/db", "@/db/*", "@/lib/dal", "@/lib/dal/*", "fs", "node:*"] },
      ],
    },
  },
  {
    files: ["components/**/*.{ts,tsx}", "app/**/*.tsx"],
    rules: { "no-restricted-imports": ["error", { patterns: ["@/db", "@/db/*"] }] },
  },
];

export default config;
