import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROLES, ROUTE_RULES, rolesWith, ruleFor } from '~/lib/access';
import { routeFiles } from '../helpers/route-files';

/** Rules that serve no route file, each with its reason. */
const RULES_WITHOUT_FILES: Record<string, string> = {
  [String(/^\/(_astro|fonts|favicon)/)]: 'built assets served by the adapter, not route files',
};

const files = routeFiles();

describe('ROUTE_RULES and the route files under src/pages stay in step (derived from the file tree)', () => {
  it('finds the route files', () => {
    expect(files.length).toBeGreaterThan(50);
    for (const f of files) expect(f.methods.length, f.file).toBeGreaterThan(0);
  });

  it.each(files.flatMap((f) => f.methods.map((m) => ({ route: f.route, method: m, sample: f.sample }))))('$method $route has a rule', ({ method, sample }) => {
    expect(ruleFor(sample, method)).toBeDefined();
  });

  it.each(ROUTE_RULES.map((rule, i) => ({ i, rule, name: `${String(rule.pattern)}${rule.methods ? ` ${rule.methods.join('/')}` : ''}` })))(
    'rule $name is the first match of some route file',
    ({ rule }) => {
      const served = files.some((f) => f.methods.some((m) => ruleFor(f.sample, m) === rule));
      if (RULES_WITHOUT_FILES[String(rule.pattern)]) expect(served).toBe(false);
      else expect(served).toBe(true);
    },
  );
});

describe('roles are named once, in src/lib/access.ts', () => {
  it('auth.ts types no role name and no default role of its own', () => {
    const text = fs.readFileSync(path.resolve(import.meta.dirname, '../../src/lib/server/auth.ts'), 'utf8');
    for (const role of ROLES) expect(text, `auth.ts names the role '${role}'`).not.toMatch(new RegExp(`['"\`]${role}['"\`]`));
  });
  it('the user administrators of the auth plugin are the roles granted users:manage', () => {
    expect(rolesWith('users:manage')).toEqual(['admin']);
  });
  it('no service keeps role logic of its own (pick-lists/access.ts is folded into access.ts)', () => {
    expect(fs.existsSync(path.resolve(import.meta.dirname, '../../src/lib/server/services/pick-lists/access.ts'))).toBe(false);
  });
});
