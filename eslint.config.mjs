// Lint: Next's rules plus the import direction of the house style
// (domain/ imports no framework or database code; components/ never imports database/ or app/;
// a route never reaches into another route's private folder; app/_server stays on the server).
import { readdirSync } from "node:fs";
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const frameworkPackages = ["next", "next/*", "react", "react-dom", "knex", "mysql2", "iron-session", "@/app/*", "@/components/*", "@/database/*"];
// domain/ is pure: besides the framework, no Node built-ins, logger, object store, mail or server marker.
const domainForbidden = [...frameworkPackages, "react/*", "react-dom/*", "node:*", "pino", "pino/*", "@aws-sdk/*", "nodemailer", "nodemailer/*", "server-only"];

// Each route segment's private folders (`_lib`, `_components`, `_client`, …) belong to that
// segment alone: files outside app/<group>/<segment>/ may not import them. What two routes
// share moves down a layer (app/_server, components/, domain/).
const dirs = (path) => readdirSync(path, { withFileTypes: true });
const privateFolderZones = [];
for (const group of ["(signed-in)", "(signed-out)"]) {
  const segments = dirs(`app/${group}`).filter((d) => d.isDirectory() && !d.name.startsWith("_"));
  for (const segment of segments) {
    const elsewhere = [
      ...dirs("app").filter((d) => d.name !== group).map((d) => `./app/${d.name}`),
      ...dirs(`app/${group}`).filter((d) => d.name !== segment.name).map((d) => `./app/${group}/${d.name}`),
      "./components",
    ];
    privateFolderZones.push({
      target: elsewhere,
      from: `./app/${group}/${segment.name}/_*/**`,
      message: `A route never reaches into another route's private folder (${group}/${segment.name}/_*): move what both need to app/_server, components/ or domain/.`,
    });
  }
}

// 'use client' modules run in the browser: they may not import the server layer (type-only
// imports are erased and allowed).
const noServerLayerInClient = {
  meta: { type: "problem", schema: [], messages: { server: "A 'use client' module may not import the server layer (app/_server); pass plain data as props or call an action." } },
  create(context) {
    const body = context.sourceCode.ast.body;
    const isClient = body.some((node) => node.type === "ExpressionStatement" && node.directive === "use client");
    if (!isClient) return {};
    const check = (node, source) => {
      if (node.importKind === "type" || node.exportKind === "type") return;
      if (node.specifiers?.length && node.specifiers.every((s) => s.importKind === "type")) return;
      if (/(^|\/)app\/_server(\/|$)|^@\/app\/_server/.test(source) || /(^|\/)_server\//.test(source)) context.report({ node, messageId: "server" });
    };
    return {
      ImportDeclaration: (node) => check(node, node.source.value),
      ExportNamedDeclaration: (node) => node.source && check(node, node.source.value),
      ExportAllDeclaration: (node) => check(node, node.source.value),
      ImportExpression: (node) => node.source.type === "Literal" && check(node, String(node.source.value)),
    };
  },
};

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: [".next/**", ".next-*/**", ".data/**", "node_modules/**", "next-env.d.ts", "tests/bench/results/**", "test-results/**"],
  },
  {
    plugins: { beadline: { rules: { "no-server-layer-in-client": noServerLayerInClient } } },
    rules: {
      "import/no-cycle": ["error", { maxDepth: 10 }],
      "import/no-restricted-paths": [
        "error",
        {
          zones: [
            { target: "./domain", from: "./app", message: "domain/ is pure: no app imports." },
            { target: "./domain", from: "./components", message: "domain/ is pure: no component imports." },
            { target: "./domain", from: "./database", message: "domain/ is pure: no database imports." },
            { target: "./components", from: "./database", message: "components/ never imports database/." },
            { target: "./components", from: "./app", message: "components/ never imports app/ (routes, the server layer)." },
            { target: "./database", from: "./app", message: "database/ never imports app/." },
            { target: "./database", from: "./components", message: "database/ never imports components/." },
            ...privateFolderZones,
          ],
        },
      ],
      "beadline/no-server-layer-in-client": "error",
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    files: ["domain/**/*.{ts,tsx}"],
    rules: {
      "no-restricted-imports": ["error", { patterns: domainForbidden.map((group) => ({ group: [group], message: "domain/ imports no framework, Node, database, logging, storage, mail or session code." })) }],
      // No clock and no randomness in domain/: callers pass `now` and ids in.
      "no-restricted-properties": [
        "error",
        { object: "Date", property: "now", message: "domain/ has no clock: pass `now` in." },
        { object: "Math", property: "random", message: "domain/ has no randomness: pass ids or seeds in." },
        { object: "crypto", property: "randomUUID", message: "domain/ has no randomness: pass ids in." },
        { object: "crypto", property: "getRandomValues", message: "domain/ has no randomness: pass ids in." },
      ],
      "no-restricted-syntax": [
        "error",
        { selector: "NewExpression[callee.name='Date'][arguments.length=0]", message: "domain/ has no clock: `new Date()` reads it; pass `now` in." },
        { selector: "CallExpression[callee.name='Date'][arguments.length=0]", message: "domain/ has no clock: `Date()` reads it; pass `now` in." },
        { selector: "CallExpression[callee.name='randomUUID']", message: "domain/ has no randomness: pass ids in." },
      ],
    },
  },
  {
    files: ["components/**/*.{ts,tsx}"],
    rules: {
      "no-restricted-imports": ["error", { patterns: [{ group: ["knex", "mysql2", "@/database/*", "@/app/*"], message: "components/ never imports database or app code." }] }],
    },
  },
  {
    files: ["**/*.js", "**/*.cjs"],
    rules: { "@typescript-eslint/no-require-imports": "off" },
  },
];

export default config;
