/**
 * The layering of DEVELOPERS.md ("Architecture in a page"), checked on the source tree: every
 * import in src/ is read with the TypeScript parser (Astro files: their frontmatter and
 * scripts), resolved through the `~/` alias or its relative path, and held against the rules
 * below. A failure lists each offending file with the import that breaks the rule.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const SOURCE = /\.(ts|tsx|mts|mjs|js|astro)$/;

interface ImportEdge {
  /** What the source says, e.g. `~/db/client`, `../env`, `node:fs`. */
  specifier: string;
  /** Repository path of an import into the project (`src/db/client`), null for a package. */
  target: string | null;
  /** `import type` / `export type`, or only type-only names: erased before anything runs. */
  typeOnly: boolean;
}

interface SourceFile {
  /** Repository path with forward slashes, e.g. `src/core/fit/fit-curve-family.ts`. */
  path: string;
  imports: ImportEdge[];
  /** `process.…` or `import.meta.env` reads, as written. */
  processReads: string[];
}

function listSources(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const full = join(dir, e.name);
    if (e.isDirectory()) return listSources(full);
    return SOURCE.test(e.name) && !e.name.endsWith('.d.ts') ? [full] : [];
  });
}

/** The script parts of an Astro file: its frontmatter and every `<script>` body. */
function astroScripts(text: string): string {
  const front = /^---\r?\n([\s\S]*?)\r?\n---/.exec(text)?.[1] ?? '';
  const scripts = [...text.matchAll(/<script\b[^>]*>([\s\S]*?)<\/script>/g)].map((m) => m[1]);
  return [front, ...scripts].join('\n;\n');
}

function resolveTarget(fromPath: string, specifier: string): string | null {
  if (specifier.startsWith('~/')) return `src/${specifier.slice(2)}`;
  if (specifier.startsWith('.')) return relative(ROOT, resolve(ROOT, dirname(fromPath), specifier)).split(sep).join('/');
  return null;
}

/** The imports and environment reads of one file; `path` is its repository path. */
function parseSource(path: string, raw: string): SourceFile {
  const text = path.endsWith('.astro') ? astroScripts(raw) : raw;
  const kind = path.endsWith('.tsx') ? ts.ScriptKind.TSX : ts.ScriptKind.TS;
  const file = ts.createSourceFile(path, text, ts.ScriptTarget.Latest, true, kind);
  const imports: ImportEdge[] = [];
  const processReads: string[] = [];
  const add = (specifier: string, typeOnly: boolean) => imports.push({ specifier, target: resolveTarget(path, specifier), typeOnly });

  const visit = (node: ts.Node): void => {
    if (ts.isImportDeclaration(node) && ts.isStringLiteral(node.moduleSpecifier)) {
      const clause = node.importClause;
      const named = clause?.namedBindings && ts.isNamedImports(clause.namedBindings) ? clause.namedBindings : undefined;
      const onlyTypeNames = !!clause && !clause.name && !!named && named.elements.length > 0 && named.elements.every((e) => e.isTypeOnly);
      add(node.moduleSpecifier.text, !!clause && (clause.isTypeOnly || onlyTypeNames));
    } else if (ts.isExportDeclaration(node) && node.moduleSpecifier && ts.isStringLiteral(node.moduleSpecifier)) {
      const named = node.exportClause && ts.isNamedExports(node.exportClause) ? node.exportClause : undefined;
      const onlyTypeNames = !!named && named.elements.length > 0 && named.elements.every((e) => e.isTypeOnly);
      add(node.moduleSpecifier.text, node.isTypeOnly || onlyTypeNames);
    } else if (ts.isImportTypeNode(node) && ts.isLiteralTypeNode(node.argument) && ts.isStringLiteral(node.argument.literal)) {
      add(node.argument.literal.text, true);
    } else if (ts.isCallExpression(node) && node.arguments.length > 0 && ts.isStringLiteralLike(node.arguments[0])) {
      const callee = node.expression;
      const dynamicImport = callee.kind === ts.SyntaxKind.ImportKeyword;
      const requireCall = ts.isIdentifier(callee) && callee.text === 'require';
      if (dynamicImport || requireCall) add(node.arguments[0].text, false);
    } else if (ts.isPropertyAccessExpression(node)) {
      const target = node.expression;
      const isProcess = ts.isIdentifier(target) && target.text === 'process';
      const isMetaEnv = ts.isMetaProperty(target) && node.name.text === 'env';
      // `process.env.PORT` reads as its whole expression, so the message names the variable.
      const whole = ts.isPropertyAccessExpression(node.parent) && node.parent.expression === node ? node.parent : node;
      if (isProcess || isMetaEnv) processReads.push(whole.getText(file));
    }
    ts.forEachChild(node, visit);
  };
  visit(file);
  return { path, imports, processReads };
}

const sources = listSources(join(ROOT, 'src')).map((full) => parseSource(relative(ROOT, full).split(sep).join('/'), readFileSync(full, 'utf8')));

const under = (folder: string) => (path: string | null) => path !== null && (path === folder || path.startsWith(`${folder}/`));
const packageName = (specifier: string) => specifier.split('/').slice(0, specifier.startsWith('@') ? 2 : 1).join('/');
const NODE_BUILTINS = new Set(builtinModules.filter((m) => !m.startsWith('_')));
const isNodeBuiltin = (specifier: string) => specifier.startsWith('node:') || NODE_BUILTINS.has(packageName(specifier));

/** Packages that talk to the outside world or belong to a layer above the core. */
const IMPURE_PACKAGES = new Set([
  'pg', 'drizzle-orm', 'drizzle-kit', 'pg-boss', 'nodemailer', 'mailparser', 'better-auth', 'bwip-js',
  'astro', '@astrojs/node', '@astrojs/react', 'react', 'react-dom', '@tanstack/react-query',
]);
/** Packages that open connections or read secrets: never in a browser bundle. */
const SERVER_PACKAGES = new Set(['pg', 'drizzle-orm', 'drizzle-kit', 'pg-boss', 'nodemailer', 'mailparser', 'better-auth']);
/** Packages that speak SQL: the HTTP layer calls services instead. */
const SQL_PACKAGES = new Set(['pg', 'drizzle-orm', 'pg-boss']);

/** The modules that read the environment; everything else is handed its configuration. */
const CONFIGURATION_MODULES = new Set([
  'src/lib/server/env.ts',
  'src/db/db-config.ts',
  // The HTTP front starts before the app is loaded and reads only where to listen and whom to trust.
  'src/http-front/front.mjs',
]);

type Rule = (file: SourceFile, edge: ImportEdge) => string | null;

function offences(files: SourceFile[], rule: Rule): string[] {
  return files.flatMap((f) => f.imports.map((edge) => rule(f, edge)).filter((why): why is string => why !== null).map((why) => `${f.path}: ${why}`));
}

const quoted = (edge: ImportEdge) => (edge.specifier.startsWith('.') ? `'${edge.specifier}' (${edge.target})` : `'${edge.specifier}'`);

describe('architecture boundaries', () => {
  it('sees every form of import and environment read', () => {
    const f = parseSource(
      'src/core/x/sample.ts',
      [
        "import a from 'node:fs';",
        "import type { B } from '../../db/client';",
        "import { type C, type D } from '~/lib/server/env';",
        "import { type E, F } from './f';",
        "import './side-effect';",
        "export { G } from 'pg';",
        "export type { H } from '~/db/schema';",
        "const i = await import('~/lib/server/mail');",
        "const j = require('child_process');",
        "type K = import('~/db/client').Database;",
        'const l = process.env.SLUICE_X;',
        'const m = import.meta.env.PROD;',
      ].join('\n'),
    );
    expect(f.imports).toEqual([
      { specifier: 'node:fs', target: null, typeOnly: false },
      { specifier: '../../db/client', target: 'src/db/client', typeOnly: true },
      { specifier: '~/lib/server/env', target: 'src/lib/server/env', typeOnly: true },
      { specifier: './f', target: 'src/core/x/f', typeOnly: false },
      { specifier: './side-effect', target: 'src/core/x/side-effect', typeOnly: false },
      { specifier: 'pg', target: null, typeOnly: false },
      { specifier: '~/db/schema', target: 'src/db/schema', typeOnly: true },
      { specifier: '~/lib/server/mail', target: 'src/lib/server/mail', typeOnly: false },
      { specifier: 'child_process', target: null, typeOnly: false },
      { specifier: '~/db/client', target: 'src/db/client', typeOnly: true },
    ]);
    expect(f.processReads).toEqual(['process.env.SLUICE_X', 'import.meta.env.PROD']);
    const astro = parseSource('src/pages/x.astro', "---\nimport { getDb } from '~/db/client';\n---\n<p>hi</p>\n<script>import '~/components/y';</script>\n");
    expect(astro.imports.map((e) => e.target)).toEqual(['src/db/client', 'src/components/y']);
  });

  it('reads the source tree', () => {
    // A parser that found nothing would pass every rule below.
    expect(sources.filter((f) => f.path.startsWith('src/core/')).length).toBeGreaterThan(50);
    expect(sources.filter((f) => f.path.startsWith('src/pages/api/')).length).toBeGreaterThan(50);
    expect(sources.flatMap((f) => f.imports).length).toBeGreaterThan(1000);
  });

  it('src/core is pure: no Node built-ins, I/O or framework packages, nothing outside src/core', () => {
    const core = sources.filter((f) => under('src/core')(f.path));
    const found = offences(core, (_f, edge) => {
      if (edge.target !== null) return under('src/core')(edge.target) ? null : `imports ${quoted(edge)} from outside src/core`;
      if (isNodeBuiltin(edge.specifier)) return `imports the Node built-in '${edge.specifier}'`;
      if (edge.specifier.startsWith('astro:') || IMPURE_PACKAGES.has(packageName(edge.specifier))) return `imports the package '${edge.specifier}'`;
      return null;
    });
    const reads = core.flatMap((f) => f.processReads.map((r) => `${f.path}: reads ${r}`));
    expect([...found, ...reads], 'src/core must stay pure (see DEVELOPERS.md, Architecture)').toEqual([]);
  });

  it('endpoints under src/pages/api reach the database only through services', () => {
    const api = sources.filter((f) => under('src/pages/api')(f.path));
    const found = offences(api, (_f, edge) => {
      if (under('src/db')(edge.target)) return `imports ${quoted(edge)}; call a service in src/lib/server/services instead`;
      if (edge.target === null && SQL_PACKAGES.has(packageName(edge.specifier))) return `imports the package '${edge.specifier}'; call a service instead`;
      return null;
    });
    expect(found, 'an endpoint calls one service').toEqual([]);
  });

  it('islands (src/components) import no server module, not even `import type` from a service', () => {
    // The shapes an island reads are the contracts in src/contracts: a type taken from a
    // service would tie the browser code to how the server builds its answer.
    const islands = sources.filter((f) => under('src/components')(f.path));
    const found = offences(islands, (_f, edge) => {
      if (under('src/db')(edge.target)) return `imports ${quoted(edge)}; islands fetch JSON from /api/`;
      if (under('src/lib/server')(edge.target)) return `imports ${quoted(edge)}; read the answer's contract from src/contracts`;
      if (edge.target === null && (isNodeBuiltin(edge.specifier) || SERVER_PACKAGES.has(packageName(edge.specifier)) || edge.specifier.startsWith('astro:')))
        return `imports the server-side package '${edge.specifier}'`;
      return null;
    });
    expect(found, 'islands run in the browser').toEqual([]);
  });

  it('src/contracts imports zod, src/core and the role list only, so every layer may import it', () => {
    const contracts = sources.filter((f) => under('src/contracts')(f.path));
    expect(contracts.length).toBeGreaterThan(5);
    const found = offences(contracts, (_f, edge) => {
      if (edge.target === null) return edge.specifier === 'zod' ? null : `imports the package '${edge.specifier}'`;
      if (under('src/contracts')(edge.target) || under('src/core')(edge.target) || edge.target === 'src/lib/access') return null;
      return `imports ${quoted(edge)}`;
    });
    expect(found, 'contracts are plain data shared by services, endpoints and islands').toEqual([]);
  });

  it('src/db depends on nothing in src/lib, src/pages or src/components', () => {
    const db = sources.filter((f) => under('src/db')(f.path));
    const found = offences(db, (_f, edge) =>
      ['src/lib', 'src/pages', 'src/components'].some((folder) => under(folder)(edge.target)) ? `imports ${quoted(edge)}` : null,
    );
    expect(found, 'the database layer sits below the services').toEqual([]);
  });

  it('only the configuration modules read process.env', () => {
    const found = sources
      .filter((f) => !CONFIGURATION_MODULES.has(f.path))
      .flatMap((f) => f.processReads.filter((r) => /^(process\.env|import\.meta\.env)\b/.test(r)).map((r) => `${f.path}: reads ${r}`));
    expect(found, `read configuration through serverEnv() (src/lib/server/env.ts)`).toEqual([]);
  });

  it('imports into src never climb two folders up: they use the ~/ alias', () => {
    const found = offences(sources, (_f, edge) => (edge.specifier.startsWith('../../') ? `imports '${edge.specifier}'; write '~/${edge.target?.slice(4)}'` : null));
    expect(found).toEqual([]);
  });
});
