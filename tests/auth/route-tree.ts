// The app's route tree, read from the source the way Next.js's App Router reads it, for the
// authorization matrix: every page and every route handler method must have a row. Conventions
// (Next.js docs, "Project structure" and "route.js"): a folder's `page` file makes a page and its
// `route` file a handler, in .js/.jsx/.ts/.tsx (and page.mdx); `(group)` folders and `@slot` folders
// do not appear in the URL, `_private` folders are not routable; a handler's methods are its exports
// named GET, HEAD, POST, PUT, DELETE, PATCH or OPTIONS — however they are exported (const, function,
// `export { x as GET }`, re-exports). Exports are read with the TypeScript parser, not a regex.
import fs from "node:fs";
import path from "node:path";
import ts from "typescript";

export const HTTP_METHODS = ["GET", "HEAD", "POST", "PUT", "DELETE", "PATCH", "OPTIONS"] as const;
const PAGE_FILE = /^page\.(js|jsx|ts|tsx|mdx)$/;
const ROUTE_FILE = /^route\.(js|jsx|ts|tsx|mjs)$/;

/** Names a module exports (for `export * from` the names of the module it re-exports, resolved). */
export function exportedNames(file: string, seen = new Set<string>()): string[] {
  if (seen.has(file)) return [];
  seen.add(file);
  const source = ts.createSourceFile(file, fs.readFileSync(file, "utf8"), ts.ScriptTarget.Latest, true);
  const names: string[] = [];
  const exported = (node: ts.Node) =>
    ts.canHaveModifiers(node) && (ts.getModifiers(node) ?? []).some((m) => m.kind === ts.SyntaxKind.ExportKeyword);
  for (const statement of source.statements) {
    if (ts.isVariableStatement(statement) && exported(statement)) {
      for (const d of statement.declarationList.declarations) if (ts.isIdentifier(d.name)) names.push(d.name.text);
    } else if ((ts.isFunctionDeclaration(statement) || ts.isClassDeclaration(statement)) && exported(statement)) {
      if (statement.name) names.push(statement.name.text);
    } else if (ts.isExportDeclaration(statement)) {
      if (statement.exportClause && ts.isNamedExports(statement.exportClause)) {
        for (const e of statement.exportClause.elements) names.push(e.name.text);
      } else if (
        !statement.exportClause &&
        statement.moduleSpecifier &&
        ts.isStringLiteral(statement.moduleSpecifier)
      ) {
        const target = resolveModule(file, statement.moduleSpecifier.text);
        if (target) names.push(...exportedNames(target, seen));
        else names.push(`* from ${statement.moduleSpecifier.text}`); // unresolvable: reported, never ignored
      }
    }
  }
  return names;
}

function resolveModule(from: string, specifier: string): string | null {
  const base = specifier.startsWith("@/")
    ? path.resolve(specifier.slice(2))
    : specifier.startsWith(".")
      ? path.resolve(path.dirname(from), specifier)
      : null;
  if (!base) return null;
  for (const candidate of [base, ...[".ts", ".tsx", ".js", ".mjs"].map((e) => base + e), path.join(base, "index.ts")]) {
    if (fs.existsSync(candidate) && fs.statSync(candidate).isFile()) return candidate;
  }
  return null;
}

/** Every page ("PAGE /route") and handler method ("GET /route") under `appDir`, sorted. */
export function discoverRoutes(appDir = "app"): string[] {
  const found: string[] = [];
  const walk = (dir: string, segments: string[]) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) {
        if (entry.name.startsWith("_")) continue; // private folder: not routable
        const hidden = /^\(.*\)$/.test(entry.name) || entry.name.startsWith("@");
        walk(full, hidden ? segments : [...segments, entry.name]);
        continue;
      }
      const route = "/" + segments.join("/");
      if (PAGE_FILE.test(entry.name)) found.push(`PAGE ${route}`);
      else if (ROUTE_FILE.test(entry.name)) {
        const methods = exportedNames(full).filter(
          (n) => (HTTP_METHODS as readonly string[]).includes(n) || n.startsWith("* from"),
        );
        // A route file that exports no method answers 405 to everything: still list it, so it is seen.
        if (methods.length === 0) found.push(`NONE ${route}`);
        for (const m of methods) found.push(`${m} ${route}`);
      }
    }
  };
  walk(appDir, []);
  return found.sort();
}

/** Files declaring server actions ("use server" at the top, or inside a function), for the matrix. */
export function discoverServerActionFiles(dirs = ["app", "lib"]): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (/\.(ts|tsx|js|jsx|mjs)$/.test(entry.name) && /["']use server["']/.test(fs.readFileSync(full, "utf8"))) {
        out.push(full);
      }
    }
  };
  for (const d of dirs) if (fs.existsSync(d)) walk(d);
  return out.sort();
}

/**
 * The routes the production build actually serves, from its app-paths manifest (keys such as
 * "/(app)/account/page" and "/api/session/route"), as "PAGE /route" / "ROUTE /route"; null when no
 * build is found. Framework entries (_not-found, _global-error) are left out.
 */
export function builtRoutes(distDir = process.env.NEXT_DIST_DIR || ".next"): string[] | null {
  const file = path.join(distDir, "server", "app-paths-manifest.json");
  if (!fs.existsSync(file)) return null;
  const manifest = JSON.parse(fs.readFileSync(file, "utf8")) as Record<string, string>;
  const out = new Set<string>();
  for (const key of Object.keys(manifest)) {
    const m = /^(.*)\/(page|route)$/.exec(key);
    if (!m) continue;
    const segments = m[1].split("/").filter((s) => s && !/^\(.*\)$/.test(s) && !s.startsWith("@"));
    if (segments[0]?.startsWith("_")) continue;
    out.add(`${m[2] === "page" ? "PAGE" : "ROUTE"} /${segments.join("/")}`);
  }
  return [...out].sort();
}
