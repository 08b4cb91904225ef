// Papin's lint rules: Next's core-web-vitals set (React, react-hooks, jsx-a11y, import), typescript-eslint's
// recommended set, Prettier's opt-outs, and the layer boundaries of DEVELOPERS.md as restricted imports per folder.
import { defineConfig, globalIgnores } from "eslint/config";
import nextCoreWebVitals from "eslint-config-next/core-web-vitals";
import nextTypeScript from "eslint-config-next/typescript";
import prettier from "eslint-config-prettier/flat";

/**
 * Patterns that catch a folder however it is named: `@/db`, `@/db/queries/x`, `../../db`, and from inside lib/
 * also `../services`. `root` is the folder's path from the repository root, without a trailing slash.
 */
function folder(root, message) {
  const escaped = root.replaceAll("/", "\\/").replaceAll(".", "\\.");
  const patterns = [
    { regex: `^@\\/${escaped}(?:\\/|$)`, message },
    { regex: `^(?:\\.\\.\\/)+${escaped}(?:\\/|$)`, message },
  ];
  if (root.startsWith("lib/")) {
    const inLib = escaped.slice("lib\\/".length);
    patterns.push({ regex: `^(?:\\.\\.\\/)+${inLib}(?:\\/|$)`, message });
  }
  return patterns;
}

/** One `no-restricted-imports` setting for the files of a layer. */
function layer(files, { folders = [], packages = [], patterns = [] }) {
  return {
    files,
    rules: {
      "no-restricted-imports": [
        "error",
        {
          paths: packages.map(([name, message]) => ({ name, message })),
          patterns: [...folders.flatMap(([root, message]) => folder(root, message)), ...patterns],
        },
      ],
    },
  };
}

const UP = "the layers go app → lib/services → db/queries and the pure cores (see DEVELOPERS.md)";
const PURE_CORE = `the pure cores (lib/steam, lib/logger-files, lib/analysis) take arrays and values and give figures: no database, services, UI, framework or server-only code; ${UP}`;
const UI_ONLY = `components/ is UI only and may reach the browser: take data as props and labels from lib/domain; ${UP}`;

export default defineConfig([
  globalIgnores([".next/**", "node_modules/**", "data/**", "coverage/**", "test-results/**", "playwright-report/**", "bench-output/**", "tmp/**", "next-env.d.ts", "db/migrations/**"]),
  ...nextCoreWebVitals,
  ...nextTypeScript,
  prettier,

  // Configuration comes from one validated place; tests and their tools set variables for the code they run.
  {
    files: ["**/*.{js,jsx,mjs,cjs,ts,tsx,mts,cts}"],
    ignores: ["lib/env.ts", "tests/**"],
    rules: {
      "no-restricted-properties": [
        "error",
        { object: "process", property: "env", message: "Read configuration through env() from lib/env.ts, where every variable is declared, validated and documented." },
      ],
    },
  },

  layer(["lib/domain/**"], {
    patterns: [
      {
        regex: "^(?!\\./|@/lib/domain(?:/|$))",
        message: "lib/domain imports nothing outside itself (no packages, no other Papin folders): siblings by ./name or @/lib/domain/name.",
      },
    ],
  }),

  layer(["lib/steam/**", "lib/logger-files/**", "lib/analysis/**"], {
    folders: [
      ["db", PURE_CORE],
      ["lib/services", PURE_CORE],
      ["components", PURE_CORE],
      ["app", PURE_CORE],
    ],
    packages: [["server-only", PURE_CORE]],
    patterns: [{ regex: "^next(?:[-/]|$)", message: PURE_CORE }],
  }),

  layer(["components/**"], {
    folders: [
      ["db", UI_ONLY],
      ["lib/services", UI_ONLY],
      ["lib/auth/guards", `${UI_ONLY} (pages guard with requirePageActor and pass the actor down)`],
      ["lib/auth/page-guard", `${UI_ONLY} (pages guard with requirePageActor and pass the actor down)`],
      ["lib/auth/options", UI_ONLY],
      ["lib/auth/password", UI_ONLY],
      ["lib/mail", UI_ONLY],
      ["lib/env", `${UI_ONLY} (a page reads the setting and passes it as a prop)`],
    ],
    packages: [["server-only", UI_ONLY]],
    patterns: [
      // The PDF report (react-pdf) is server code; its scale module is plain tick and path arithmetic shared with the web chart.
      { regex: "^(?:@\\/|(?:\\.\\.\\/)+)(?:lib\\/)?reports(?:\\/(?!scale$)|$)", message: `${UI_ONLY} (the PDF report is rendered on the server)` },
    ],
  }),

  layer(["app/**"], {
    folders: [["db", `pages, route handlers and actions parse the input, get the actor and call one lib/services function; ${UP}`]],
  }),

  layer(["db/queries/**"], {
    folders: [
      ["lib/services", `db/queries holds SQL only (one query or one transaction); the workflow belongs in lib/services; ${UP}`],
      ["components", `db/queries holds SQL only; ${UP}`],
      ["app", `db/queries holds SQL only; ${UP}`],
      ["lib/reports", `db/queries holds SQL only: PDF rendering belongs in lib/services; ${UP}`],
      ["lib/mail", `db/queries holds SQL only: mail belongs in lib/services (the outbox row itself is SQL); ${UP}`],
      ["lib/auth/password", `db/queries holds SQL only: password hashing belongs in lib/services; ${UP}`],
      ["lib/logger-files", `db/queries holds SQL only: parsing logger files belongs in lib/services; ${UP}`],
      ["lib/analysis", `db/queries holds SQL only: analysing belongs in lib/services; ${UP}`],
    ],
  }),

  layer(["lib/services/**"], {
    folders: [
      ["components", `lib/services is server-only workflow code and returns data, not UI; ${UP}`],
      ["app", `lib/services is called by app/, never the reverse; ${UP}`],
    ],
  }),
]);
