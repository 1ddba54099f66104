// Lint: Next's rules plus the import direction of the house style
// (domain/ imports no framework or database code; components/ never imports database/).
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const frameworkPackages = ["next", "next/*", "react", "react-dom", "knex", "mysql2", "iron-session", "@/app/*", "@/components/*", "@/database/*"];

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: [".next/**", ".next-*/**", ".data/**", "node_modules/**", "next-env.d.ts", "tests/bench/results/**", "test-results/**"],
  },
  {
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
            { target: "./database", from: "./app", message: "database/ never imports app/." },
            { target: "./database", from: "./components", message: "database/ never imports components/." },
          ],
        },
      ],
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    files: ["domain/**/*.ts"],
    rules: {
      "no-restricted-imports": ["error", { patterns: frameworkPackages.map((group) => ({ group: [group], message: "domain/ imports no framework, database or session code." })) }],
    },
  },
  {
    files: ["components/**/*.{ts,tsx}"],
    rules: {
      "no-restricted-imports": ["error", { patterns: [{ group: ["knex", "mysql2", "@/database/*"], message: "components/ never imports database code." }] }],
    },
  },
  {
    files: ["**/*.js", "**/*.cjs"],
    rules: { "@typescript-eslint/no-require-imports": "off" },
  },
];

export default config;
