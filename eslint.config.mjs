// ESLint: Next's flat config (core web vitals: React, hooks, a11y, import rules) plus typescript-eslint's recommended
// rules. `npm run lint` fails on errors; warnings are printed and left for judgement.
import { defineConfig, globalIgnores } from "eslint/config";
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTypescript from "eslint-config-next/typescript";
import prettier from "eslint-config-prettier/flat";

export default defineConfig([
  ...nextVitals,
  ...nextTypescript,
  prettier,
  globalIgnores([".next/**", "dist/**", "data/**", "node_modules/**", "drizzle/**", "test-results/**", "playwright-report/**", "next-env.d.ts", "backups/**"]),
  {
    rules: {
      // `_name` marks a value left unused on purpose (a destructured field dropped, a parameter kept for its position)
      "@typescript-eslint/no-unused-vars": [
        "error",
        { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrorsIgnorePattern: "^_", destructuredArrayIgnorePattern: "^_", ignoreRestSiblings: true },
      ],
    },
  },
  {
    // The 3D scene drives three.js objects (camera, controls), which are mutable by design and changed in callbacks and
    // effects, as React Three Fiber's own examples do; the React Compiler's immutability check does not apply to them.
    files: ["scene/**/*.tsx"],
    rules: { "react-hooks/immutability": "off" },
  },
  {
    // command-line scripts, launchers and configs are CommonJS or plain Node: require() is their module system
    files: ["bin/**/*.cjs", "scripts/**/*.mjs", "**/*.config.*"],
    rules: { "@typescript-eslint/no-require-imports": "off" },
  },
]);
