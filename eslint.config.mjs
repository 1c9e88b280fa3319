// ESLint: Next.js's core-web-vitals and TypeScript rules, plus the project's boundaries (below).
// Prettier owns formatting (npm run lint runs both).
import fs from "node:fs";
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";
import importX from "eslint-plugin-import-x";

// The direction of dependence, checked on every import (DEVELOPERS.md explains it): app/ and
// scripts/ use lib/; lib/ uses db/; each lib domain imports only the domains listed for it here, so
// the map is a one-way graph. A new arrow is a change to this table, reviewed like any other.
// Names are folders (lib/x/) or single-file domains (lib/x.ts). An entry "x/file.ts" allows that one
// file of domain x, a leaf below the rest of x (lib/http/client-ip.ts sits below auth, while
// lib/http/route.ts sits above it). Every lib domain may use db/.
const LIB_DOMAINS = {
  // Leaves: no project imports.
  hazard: [], // the engine: pure TypeScript, runs in the browser too
  env: ["roles"], // role names in the sign-in settings (OIDC_GROUP_ROLES)
  errors: [], // the one error type and its status table
  caution: [],
  client: [], // browser helpers for forms
  "about-figures": [], // the "About these figures" note
  roles: [], // the one list of roles and their labels
  "tier-colours": ["hazard"],
  "tier-glyph": ["hazard"],
  "signal-word": ["hazard"],
  // Infrastructure every domain may lean on.
  audit: [],
  storage: ["env"],
  ratelimit: ["env", "errors"],
  settings: ["audit", "auth"],
  auth: ["audit", "env", "errors", "ratelimit", "roles", "http/client-ip.ts", "http/return-path.ts"],
  http: ["auth", "env", "errors", "ratelimit"],
  // Queueing mail inside a domain's transaction; an invitation's link is rebuilt from its id.
  outbox: ["audit", "env", "users/invitation-token.ts"],
  signing: ["audit", "auth", "errors", "ratelimit"], // password re-ask, content hash, separation of duties
  ops: ["storage"], // health checks and graceful drain
  // Tamper evidence: decision seals (key from the environment) and the verifier of the audit chain.
  records: ["audit", "env", "signing"],
  // Domains, lower ones first.
  rules: ["audit", "auth", "errors", "hazard", "roles"],
  "hazard-rules": ["hazard", "rules"],
  users: ["audit", "auth", "env", "errors", "outbox", "ratelimit"],
  apparatus: ["audit", "auth", "errors", "hazard", "hazard-rules"],
  permits: [
    "apparatus",
    "audit",
    "auth",
    "errors",
    "hazard",
    "outbox",
    "records",
    "rules",
    "settings",
    "signing",
    "users",
  ],
  applications: [
    "apparatus",
    "audit",
    "auth",
    "errors",
    "hazard",
    "hazard-rules",
    "outbox",
    "permits",
    "rules",
    "settings",
    "signing",
    "storage",
    "users",
  ],
  // Training records (issue 17): course types, people's records, the operator check and its reminders.
  training: ["applications", "audit", "auth", "errors", "outbox", "permits", "settings", "signing", "storage", "users"],
  review: [
    "applications",
    "audit",
    "auth",
    "errors",
    "hazard",
    "outbox",
    "permits",
    "records",
    "rules",
    "settings",
    "signing",
    "training",
    "users",
  ],
  // The header's search: each kind through its own domain's read rule.
  search: ["apparatus", "applications", "auth", "errors", "permits", "users"],
  // The safety committee's report (issue 18): read-only figures over permits and decisions.
  reports: ["auth", "errors", "hazard", "permits", "settings"],
  verify: [
    "auth",
    "errors",
    "hazard",
    "permits",
    "ratelimit",
    "records",
    "settings",
    "applications/schemas.ts",
    "http/client-ip.ts",
    "pdf/content.ts",
  ],
  // Re-review when an apparatus changes: flags the permits over a new revision, starts amendments.
  rereview: [
    "apparatus",
    "applications",
    "audit",
    "auth",
    "errors",
    "hazard",
    "hazard-rules",
    "outbox",
    "permits",
    "review",
    "settings",
  ],
  calendar: ["audit", "auth", "env", "errors", "outbox", "permits", "settings"],
  // Pre-use checks at the bench: a permit's checklist, the check and its mail, photos in storage.
  checks: ["applications", "audit", "auth", "errors", "hazard", "outbox", "permits", "storage", "users"],
  pdf: [
    "applications",
    "audit",
    "auth",
    "caution",
    "env",
    "errors",
    "hazard",
    "permits",
    "reports",
    "roles",
    "settings",
    "signing",
    "signal-word",
    "storage",
    "about-figures",
    "tier-colours",
    "tier-glyph",
    "verify",
    "http/ids.ts",
  ],
  // Delivering mail renders emails/ and attaches permit PDFs and calendar files.
  mail: ["audit", "calendar", "env", "errors", "outbox", "pdf", "permits", "settings", "users/invitation-token.ts"],
  jobs: ["audit", "env", "errors", "mail", "outbox", "permits", "rules", "settings", "training", "upkeep"],
  // Apparatus upkeep: inspection records with photos by the attachment rules, the interval's reminder.
  upkeep: ["apparatus", "applications", "audit", "auth", "errors", "outbox", "permits", "settings", "storage"],
  // Incident and near-miss reports: links to permits and apparatus, photos by the attachment rules,
  // revoking the linked permit through the permit's own revoke path.
  incidents: [
    "apparatus",
    "applications",
    "audit",
    "auth",
    "errors",
    "outbox",
    "permits",
    "settings",
    "signing",
    "storage",
    "users",
  ],
};
// emails/ renders messages the outbox holds; it may use these lib domains and nothing else.
const EMAILS_MAY_USE = ["about-figures", "hazard", "outbox", "tier-colours", "tier-glyph"];
// db/ is below lib/: only the pure engine's types, the environment and the list of roles.
const DB_MAY_USE = ["env", "hazard", "roles"];

const isSingleFile = (name) => fs.existsSync(new URL(`./lib/${name}.ts`, import.meta.url));
const libPath = (name) => (isSingleFile(name) ? `./lib/${name}.ts` : `./lib/${name}`);
const allLib = Object.keys(LIB_DOMAINS);
const domainsOf = (allowed) => allowed.filter((a) => !a.includes("/"));
// Leaf files allowed by name, grouped by their domain: { http: ["./client-ip.ts", …] }.
const leavesOf = (allowed) =>
  allowed
    .filter((a) => a.includes("/"))
    .reduce((acc, a) => {
      const [domain, file] = a.split("/");
      (acc[domain] ??= []).push(`./${file}`);
      return acc;
    }, {});
const notAllowed = (own, allowed) =>
  allLib.filter((d) => d !== own && !domainsOf(allowed).includes(d) && !leavesOf(allowed)[d]).map(libPath);
const describe = (allowed) => allowed.join(", ") || "no other lib domain";

const boundaryZones = [
  ...allLib.flatMap((domain) => {
    const allowed = LIB_DOMAINS[domain];
    const message = `lib/${domain} may import only: ${describe(allowed)} (eslint.config.mjs, DEVELOPERS.md).`;
    return [
      {
        target: libPath(domain),
        // mail renders the e-mail bodies
        from: [...notAllowed(domain, allowed), "./emails"].filter((p) => !(domain === "mail" && p === "./emails")),
        message,
      },
      // A domain allowed single leaf files of another: everything else of it stays out.
      ...Object.entries(leavesOf(allowed)).map(([other, files]) => ({
        target: libPath(domain),
        from: libPath(other),
        except: files,
        message,
      })),
    ];
  }),
  {
    target: ["./lib", "./db", "./emails"],
    from: ["./app", "./scripts", "./tests"],
    message: "lib/, db/ and emails/ are below app/ and scripts/: move what both need into lib/.",
  },
  {
    target: "./db",
    from: [...notAllowed(null, DB_MAY_USE), "./emails"],
    message: `db/ is below lib/: it may use only ${DB_MAY_USE.join(", ")}.`,
  },
  {
    target: "./emails",
    from: notAllowed(null, EMAILS_MAY_USE),
    message: `emails/ may import only ${describe(EMAILS_MAY_USE)} from lib/.`,
  },
];

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
    // Boundaries: no import cycles, and imports only in the directions of the map above.
    files: ["app/**", "lib/**", "db/**", "emails/**", "scripts/**", "*.ts"],
    // The cycle check is eslint-plugin-import-x's: eslint-plugin-import's own (2.32) serialised the
    // whole flat config for every module it visited and took 146 of the lint's 166 CPU seconds;
    // import-x finds the same cycles, through the "@/" alias too, in a fraction of that.
    plugins: { "import-x": importX },
    settings: {
      "import-x/resolver": {
        typescript: { alwaysTryTypes: true },
        node: { extensions: [".js", ".jsx", ".ts", ".tsx"] },
      },
      "import-x/parsers": { "@typescript-eslint/parser": [".ts", ".mts", ".cts", ".tsx", ".d.ts"] },
      "import-x/extensions": [".js", ".jsx", ".mjs", ".ts", ".tsx"],
    },
    rules: {
      "import-x/no-cycle": ["error", { ignoreExternal: true }],
      "import/no-restricted-paths": ["error", { zones: boundaryZones }],
    },
  },
  {
    // Tests read loosely typed JSON answers.
    files: ["tests/**"],
    rules: { "@typescript-eslint/no-explicit-any": "off" },
  },
];

export default config;
