import type { APIContext, MiddlewareNext } from 'astro';
import { defineMiddleware } from 'astro:middleware';
import { STATION_GRANTS, allows, ruleFor } from './lib/access';
import { HTTP_METHODS, matchRouteFile, routeOfFile } from './lib/route-files';
import { AppError, toResponse } from './lib/server/errors';
import { stationFromBearer, userFromHeaders } from './lib/server/identity';

/**
 * Puts the signed-in person (or test station) on `Astro.locals` and applies the route rules
 * of `lib/access.ts`: APIs answer 401/403 JSON, pages send the anonymous to sign-in and show
 * the signed-in a "not for your role" page.
 */
export const onRequest = defineMiddleware(async (context, next) => {
  const { pathname } = context.url;
  const isApi = pathname.startsWith('/api/');
  if (!isApi) return guard(context, next);
  // Every API answer is JSON `{ error: { code, message } }`, whatever went wrong and where.
  if (/%00|\u0000/i.test(context.url.pathname + context.url.search)) {
    return toResponse(new AppError('nul_in_address'));
  }
  let res: Response;
  try {
    res = await guard(context, next);
  } catch (err) {
    return toResponse(err);
  }
  if (res.status >= 400 && !(res.headers.get('content-type') ?? '').includes('json')) return apiErrorAsJson(context.request.method, pathname, res);
  return res;
});

const guard = async (context: APIContext, next: MiddlewareNext): Promise<Response> => {
  const { pathname } = context.url;
  const isApi = pathname.startsWith('/api/');
  context.locals.user = null;
  context.locals.station = null;

  const rule = ruleFor(pathname, context.request.method);
  if (rule?.need === 'public' && pathname.startsWith('/api/auth/')) return next();
  if (rule?.need === 'public' && (pathname.startsWith('/_astro') || pathname.startsWith('/fonts'))) return next();

  const bearer = context.request.headers.get('authorization');
  if (isApi && bearer?.startsWith('Bearer ')) {
    context.locals.station = await stationFromBearer(bearer);
    if (!context.locals.station) {
      return toResponse(new AppError('station_token_unknown'));
    }
  } else {
    context.locals.user = await userFromHeaders(context.request.headers);
  }

  const need = rule?.need ?? 'signed-in';
  if (need === 'public') return next();

  const grants = context.locals.user?.permissions ?? (context.locals.station ? STATION_GRANTS : null);
  if (!grants) {
    if (isApi) return toResponse(new AppError('sign_in_required'));
    return context.redirect(`/sign-in?next=${encodeURIComponent(pathname + context.url.search)}`);
  }
  if (!allows(need, grants)) {
    const needText = typeof need === 'string' ? need : need.anyOf.join(' or ');
    if (isApi) {
      return toResponse(new AppError('permission_missing', { need: needText }, { missing: needText }));
    }
    return context.rewrite(new Request(new URL(`/not-for-your-role?need=${encodeURIComponent(needText)}`, context.url), { headers: context.request.headers }));
  }
  return next();
};

const API_MODULES = import.meta.glob<Record<string, unknown>>('./pages/api/**/*.ts');
const API_ROUTES = Object.keys(API_MODULES).map((file) => ({ ...routeOfFile(file.replace(/^\.\//, 'src/')), key: file }));

/** A framework answer (an unknown path, a method the route lacks) turned into the API's JSON error. */
async function apiErrorAsJson(method: string, pathname: string, res: Response): Promise<Response> {
  const route = matchRouteFile(API_ROUTES, pathname);
  if (route && res.status === 404) {
    const mod = await API_MODULES[(route as (typeof API_ROUTES)[number]).key]();
    const methods = HTTP_METHODS.filter((m) => typeof mod[m] === 'function');
    if (!methods.includes(method as (typeof methods)[number]) && !methods.includes('ALL')) {
      return toResponse(new AppError('method_not_allowed', { route: route.route, method, allowed: methods }, { allow: methods }), {
        headers: { allow: methods.join(', ') },
      });
    }
  }
  if (res.status === 404) {
    return toResponse(new AppError('route_not_found', { method, path: pathname }));
  }
  const text = (await res.text()).slice(0, 300);
  const code = res.status === 403 ? 'request_refused_forbidden' : res.status === 413 ? 'request_refused_too_large' : res.status >= 500 ? 'server_failed' : 'request_refused';
  return toResponse(new AppError(code, { text, status: res.status }), { status: res.status });
}
