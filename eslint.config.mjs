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

const LAYERS = "(layers: app → lib/services → db/queries and the pure cores; see DEVELOPERS.md)";
const PURE_CORE = `The pure cores (lib/steam, lib/logger-files, lib/analysis) take values and give figures: no database, services, UI, framework or server-only code ${LAYERS}.`;
const ui = (hint) => `components/ is UI only and may reach the browser: ${hint} ${LAYERS}.`;
const UI_ONLY = ui("take data as props and labels from lib/domain");
const PAGE_GUARD = ui("the page guards with requirePageActor and passes the actor down");
const sqlOnly = (hint) => `db/queries holds SQL only (one query or one transaction)${hint ? `: ${hint}` : ""} ${LAYERS}.`;

export default defineConfig([
  globalIgnores([".next/**", "node_modules/**", "data/**", "coverage/**", "test-results/**", "playwright-report/**", "bench-output/**", "tmp/**", "next-env.d.ts", "db/migrations/**"]),
  ...nextCoreWebVitals,
  ...nextTypeScript,
  prettier,

  // A leading underscore marks a value left out on purpose (`const { id: _id, ...rest } = row`).
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["warn", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrorsIgnorePattern: "^_", ignoreRestSiblings: true }],
    },
  },

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
      ["lib/auth/guards", PAGE_GUARD],
      ["lib/auth/page-guard", PAGE_GUARD],
      ["lib/auth/options", UI_ONLY],
      ["lib/auth/password", UI_ONLY],
      ["lib/mail", UI_ONLY],
      ["lib/env", ui("the page reads the setting and passes it as a prop")],
    ],
    packages: [["server-only", UI_ONLY]],
    patterns: [
      // The PDF report (react-pdf) is server code; its scale module is plain tick and path arithmetic shared with the web chart.
      { regex: "^(?:@\\/|(?:\\.\\.\\/)+)(?:lib\\/)?reports(?:\\/(?!scale$)|$)", message: ui("the PDF report is rendered on the server") },
    ],
  }),

  layer(["app/**"], {
    folders: [["db", `Pages, route handlers and actions parse the input, get the actor and call one lib/services function ${LAYERS}.`]],
  }),

  layer(["db/queries/**"], {
    folders: [
      ["lib/services", sqlOnly("the workflow belongs in lib/services")],
      ["components", sqlOnly()],
      ["app", sqlOnly()],
      ["lib/reports", sqlOnly("rendering the PDF belongs in lib/services")],
      ["lib/mail", sqlOnly("mail belongs in lib/services (writing the outbox row is SQL)")],
      ["lib/auth/password", sqlOnly("password hashing belongs in lib/services")],
    ],
  }),
  // A query may name the type of what it stores (an analysis result, a mapping), but not run the code.
  {
    files: ["db/queries/**"],
    rules: {
      "@typescript-eslint/no-restricted-imports": [
        "error",
        {
          patterns: [...folder("lib/logger-files", sqlOnly("reading logger files belongs in lib/services")), ...folder("lib/analysis", sqlOnly("analysing belongs in lib/services"))].map(
            (pattern) => ({ ...pattern, allowTypeImports: true }),
          ),
        },
      ],
    },
  },

  layer(["lib/services/**"], {
    folders: [
      ["components", `lib/services is server-only workflow code and returns data, not UI ${LAYERS}.`],
      ["app", `lib/services is called by app/, never the reverse ${LAYERS}.`],
    ],
  }),
]);
