import next from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...next,
  ...nextTs,
  { ignores: [".next/**", ".next-*/**", "node_modules/**", "data/**", "public/**", "next-env.d.ts"] },
  // TanStack Table's hook is known not to memoize under the React Compiler; the register re-renders per page anyway.
  { files: ["components/samples/sample-register.tsx"], rules: { "react-hooks/incompatible-library": "off" } },
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
    // UI code reaches data through lib/dal (server) or the API (client); vocabularies come from lib/vocabulary.
    files: ["components/**/*.{ts,tsx}", "app/**/*.tsx"],
    rules: { "no-restricted-imports": ["error", { patterns: ["@/db", "@/db/*"] }] },
  },
  {
    // Components ship to the browser: zod and the schemas load on demand (lib/client/lazy-resolver.ts), not with
    // the page (about 31 kB gzip of first-load JS); choices and lifecycle rules come from zod-free modules.
    files: ["components/**/*.{ts,tsx}"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            { group: ["@/db", "@/db/*"] },
            {
              group: ["zod", "zod/*", "@/lib/validation/*", "@hookform/resolvers/*"],
              allowTypeImports: true,
              message: "Load schemas with lazyZodResolver (lib/client/lazy-resolver.ts); import choices from lib/vocabulary.ts or lib/sample-details.ts.",
            },
          ],
        },
      ],
    },
  },
  {
    // TanStack Query keys come from the factories in lib/client/query-keys.ts, never ad-hoc arrays.
    files: ["components/**/*.{ts,tsx}", "app/**/*.{ts,tsx}"],
    rules: {
      "no-restricted-syntax": [
        "error",
        {
          selector: "Property[key.name='queryKey'] > ArrayExpression",
          message: "Use a key factory from @/lib/client/query-keys instead of an ad-hoc queryKey array.",
        },
      ],
    },
  },
];

export default config;
