/**
 * Roles as data: which actions each role may take on each resource. Shared by the server
 * (middleware and services) and the browser (to hide what a person cannot use); the server
 * is the one that enforces it.
 */
export const ROLES = ['admin', 'inspector', 'designer', 'stores'] as const;
export type Role = (typeof ROLES)[number];

export const STATEMENTS = {
  users: ['manage'],
  stations: ['manage'],
  deviceTypes: ['read', 'manage'],
  binPlans: ['read', 'manage'],
  lots: ['read', 'create'],
  sweeps: ['upload', 'read'],
  fits: ['review'],
  parts: ['read'],
  stock: ['read', 'receive', 'move', 'scrap', 'return', 'labels'],
  locations: ['manage'],
  match: ['request', 'reserve'],
  pickLists: ['read', 'fulfil'],
  statistics: ['read'],
  estimates: ['use'],
  audit: ['read'],
  devMail: ['read'],
} as const;

export type Resource = keyof typeof STATEMENTS;
export type Permission = {
  [R in Resource]: `${R}:${(typeof STATEMENTS)[R][number]}`;
}[Resource];

const ROLE_GRANTS: Record<Role, readonly Permission[]> = {
  admin: [
    'users:manage',
    'stations:manage',
    'deviceTypes:read',
    'deviceTypes:manage',
    'binPlans:read',
    'binPlans:manage',
    'lots:read',
    'sweeps:read',
    'parts:read',
    'stock:read',
    'statistics:read',
    'audit:read',
    'devMail:read',
  ],
  inspector: [
    'deviceTypes:read',
    'binPlans:read',
    'lots:read',
    'lots:create',
    'sweeps:upload',
    'sweeps:read',
    'fits:review',
    'parts:read',
    'statistics:read',
    'estimates:use',
    'audit:read',
  ],
  designer: [
    'deviceTypes:read',
    'binPlans:read',
    'lots:read',
    'sweeps:read',
    'parts:read',
    'stock:read',
    'match:request',
    'match:reserve',
    'statistics:read',
    'estimates:use',
  ],
  stores: [
    'deviceTypes:read',
    'binPlans:read',
    'lots:read',
    'parts:read',
    'stock:read',
    'stock:receive',
    'stock:move',
    'stock:scrap',
    'stock:return',
    'stock:labels',
    'locations:manage',
    'pickLists:read',
    'pickLists:fulfil',
  ],
};

/** A test station is a machine identity that may only upload sweeps. */
export const STATION_GRANTS: readonly Permission[] = ['sweeps:upload'];

export function isRole(value: string): value is Role {
  return (ROLES as readonly string[]).includes(value);
}

/** Parses the admin plugin's comma-separated role field, ignoring unknown names. */
export function parseRoles(field: string | null | undefined): Role[] {
  if (!field) return [];
  return field
    .split(',')
    .map((r) => r.trim())
    .filter(isRole);
}

/**
 * better-auth's fallback role for an account created without one (Sluice's own invitations and
 * the demo always name the roles).
 */
export const DEFAULT_ROLE: Role = 'designer';

/** The roles that are granted `permission`. */
export function rolesWith(permission: Permission): Role[] {
  return ROLES.filter((r) => ROLE_GRANTS[r].includes(permission));
}

export function hasPermission(roles: readonly Role[], permission: Permission): boolean {
  return roles.some((r) => ROLE_GRANTS[r].includes(permission));
}

export function permissionsOf(roles: readonly Role[]): Permission[] {
  return [...new Set(roles.flatMap((r) => ROLE_GRANTS[r]))];
}

/**
 * Records that belong to one person: the designer who asked for a match proposal, holds a
 * reservation, or waits on its pick list. Services load them through `ownedRecordScope`, so a
 * record of someone else's is absent (404) unless a permission lets the actor see everyone's.
 */
export type OwnedRecord = 'matchProposal' | 'reservation' | 'pickList';

const OWNED_RECORD_ACCESS: Record<OwnedRecord, { everyone: Permission | null; own: Permission[] }> = {
  matchProposal: { everyone: null, own: ['match:request'] },
  reservation: { everyone: null, own: ['match:request'] },
  pickList: { everyone: 'pickLists:read', own: ['match:reserve'] },
};

/** Which records of this kind the actor may see: everyone's, their own, or none. */
export function ownedRecordScope(kind: OwnedRecord, grants: readonly Permission[]): 'everyone' | 'own' | 'none' {
  const access = OWNED_RECORD_ACCESS[kind];
  if (access.everyone && grants.includes(access.everyone)) return 'everyone';
  return access.own.some((p) => grants.includes(p)) ? 'own' : 'none';
}

/**
 * Uploads: a person who may upload sees every upload (inspectors share the intake); a test
 * station sees only the uploads it made itself.
 */
export function maySeeUpload(actor: { stationId: string | null }, upload: { stationTokenId: string | null }): boolean {
  return actor.stationId === null || upload.stationTokenId === actor.stationId;
}

/** The permissions that give any access to records of this kind. */
export function ownedRecordNeed(kind: OwnedRecord): Permission[] {
  const access = OWNED_RECORD_ACCESS[kind];
  return [...(access.everyone ? [access.everyone] : []), ...access.own];
}

/** Whether the actor (a person's id and grants) may see one record owned by `ownerUserId`. */
export function maySeeOwnedRecord(kind: OwnedRecord, actor: { userId: string | null; permissions: readonly Permission[] }, ownerUserId: string): boolean {
  const scope = ownedRecordScope(kind, actor.permissions);
  return scope === 'everyone' || (scope === 'own' && actor.userId !== null && actor.userId === ownerUserId);
}

/**
 * Pages and API routes and what each needs. First match wins; a path no rule matches needs
 * sign-in. `tests/unit/access-rules.test.ts` checks that every rule is the first match of some
 * route file under src/pages and that every route file has a rule.
 */
export interface RouteRule {
  pattern: RegExp;
  methods?: readonly string[];
  /** 'public': no sign-in; 'signed-in': any role; else the permission. */
  need: 'public' | 'signed-in' | Permission | { anyOf: Permission[] };
}

export const ROUTE_RULES: readonly RouteRule[] = [
  { pattern: /^\/$/, need: 'public' },
  { pattern: /^\/(sign-in|set-password|forgot-password)\/?$/, need: 'public' },
  { pattern: /^\/(home|not-for-your-role|sign-out)\/?$/, need: 'signed-in' },
  { pattern: /^\/api\/me\/?$/, need: 'signed-in' },
  { pattern: /^\/api\/auth\//, need: 'public' },
  { pattern: /^\/api\/health\/?$/, need: 'public' },
  // The API's description: no data in it, and stations read it before they hold a token.
  { pattern: /^\/api\/openapi\.json$/, need: 'public' },
  { pattern: /^\/(_astro|fonts|favicon)/, need: 'public' },
  { pattern: /^\/(admin\/users|api\/admin\/users)/, need: 'users:manage' },
  { pattern: /^\/(admin\/stations|api\/admin\/stations)/, need: 'stations:manage' },
  { pattern: /^\/(admin\/device-types|api\/admin\/device-types)/, need: 'deviceTypes:manage' },
  { pattern: /^\/admin\/bin-plans/, need: 'binPlans:manage' },
  { pattern: /^\/(admin\/audit|api\/admin\/audit)/, need: 'audit:read' },
  { pattern: /^\/api\/bin-plans/, methods: ['POST', 'PUT', 'PATCH', 'DELETE'], need: 'binPlans:manage' },
  { pattern: /^\/api\/bin-plans/, need: 'binPlans:read' },
  { pattern: /^\/dev\/mail/, need: 'devMail:read' },
  { pattern: /^\/api\/sweeps\/?$/, methods: ['POST'], need: 'sweeps:upload' },
  // Mailing a lot's summary to its supplier is a person's act on the lot, not a station's.
  { pattern: /^\/api\/uploads\/[^/]+\/summary-mail\/?$/, need: 'lots:create' },
  { pattern: /^\/(upload|api\/uploads)/, need: 'sweeps:upload' },
  { pattern: /^\/(review|api\/review)/, need: 'fits:review' },
  { pattern: /^\/api\/lots/, methods: ['POST'], need: 'lots:create' },
  { pattern: /^\/(lots|api\/lots)/, need: 'lots:read' },
  { pattern: /^\/(parts|api\/parts)/, need: 'parts:read' },
  { pattern: /^\/api\/stock\/receive/, need: 'stock:receive' },
  { pattern: /^\/api\/stock\/move/, need: 'stock:move' },
  { pattern: /^\/api\/stock\/scrap/, need: 'stock:scrap' },
  { pattern: /^\/api\/stock\/return/, need: 'stock:return' },
  { pattern: /^\/(stores\/count|api\/stores\/count)/, need: 'stock:move' },
  { pattern: /^\/(stores|api\/stores)/, need: { anyOf: ['stock:receive', 'stock:move'] } },
  { pattern: /^\/(labels|api\/labels)/, need: 'stock:labels' },
  { pattern: /^\/api\/locations/, methods: ['POST', 'PUT', 'PATCH', 'DELETE'], need: 'locations:manage' },
  { pattern: /^\/(locations|api\/locations)/, need: 'stock:read' },
  { pattern: /^\/api\/bins/, methods: ['POST', 'PUT', 'PATCH', 'DELETE'], need: 'locations:manage' },
  { pattern: /^\/(bins|stock|api\/bins|api\/stock)/, need: 'stock:read' },
  { pattern: /^\/(pick-lists|api\/pick-lists)/, methods: ['POST'], need: 'pickLists:fulfil' },
  { pattern: /^\/(pick-lists|api\/pick-lists)/, need: { anyOf: ['pickLists:read', 'match:reserve'] } },
  { pattern: /^\/api\/match\/proposals\/[^/]+\/confirm/, need: 'match:reserve' },
  { pattern: /^\/(match|api\/match|reservations|api\/reservations)/, need: 'match:request' },
  { pattern: /^\/(statistics|api\/statistics)/, need: 'statistics:read' },
  { pattern: /^\/(estimates|api\/estimates)/, need: 'estimates:use' },
];

export function ruleFor(pathname: string, method: string): RouteRule | undefined {
  return ROUTE_RULES.find((r) => r.pattern.test(pathname) && (!r.methods || r.methods.includes(method)));
}

export function allows(need: RouteRule['need'], grants: readonly Permission[]): boolean {
  if (need === 'public' || need === 'signed-in') return true;
  if (typeof need === 'string') return grants.includes(need);
  return need.anyOf.some((p) => grants.includes(p));
}

/** Navigation entries; each shows only to people whose roles allow its page. */
export const NAVIGATION: readonly { href: string; label: string; need: RouteRule['need'] }[] = [
  { href: '/upload', label: 'Upload sweeps', need: 'sweeps:upload' },
  { href: '/review', label: 'Review queue', need: 'fits:review' },
  { href: '/parts', label: 'Parts', need: 'parts:read' },
  { href: '/lots', label: 'Lots', need: 'lots:read' },
  { href: '/bins', label: 'Bin map', need: 'stock:read' },
  { href: '/stock', label: 'Stock', need: 'stock:read' },
  { href: '/stores', label: 'Receive & move', need: { anyOf: ['stock:receive', 'stock:move'] } },
  { href: '/stores/count', label: 'Stock count', need: 'stock:move' },
  { href: '/locations', label: 'Locations', need: 'locations:manage' },
  { href: '/labels', label: 'Labels', need: 'stock:labels' },
  { href: '/pick-lists', label: 'Pick lists', need: { anyOf: ['pickLists:read', 'match:reserve'] } },
  { href: '/match', label: 'Match sets', need: 'match:request' },
  { href: '/estimates', label: 'Stage estimates', need: 'estimates:use' },
  { href: '/statistics', label: 'Lot statistics', need: 'statistics:read' },
  { href: '/admin/users', label: 'People', need: 'users:manage' },
  { href: '/admin/stations', label: 'Stations', need: 'stations:manage' },
  { href: '/admin/device-types', label: 'Device types', need: 'deviceTypes:manage' },
  { href: '/admin/bin-plans', label: 'Bin plans', need: 'binPlans:manage' },
  { href: '/admin/audit', label: 'Audit log', need: 'audit:read' },
  { href: '/dev/mail', label: 'Caught mail', need: 'devMail:read' },
];
