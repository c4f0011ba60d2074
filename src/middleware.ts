import { defineMiddleware } from 'astro:middleware';
import { STATION_GRANTS, allows, ruleFor } from './lib/access';
import { json } from './lib/server/errors';
import { stationFromBearer, userFromHeaders } from './lib/server/identity';

/**
 * Puts the signed-in person (or test station) on `Astro.locals` and applies the route rules
 * of `lib/access.ts`: APIs answer 401/403 JSON, pages send the anonymous to sign-in and show
 * the signed-in a "not for your role" page.
 */
export const onRequest = defineMiddleware(async (context, next) => {
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
      return json({ error: { code: 'unauthenticated', message: 'The station token is unknown or revoked.' } }, 401);
    }
  } else {
    context.locals.user = await userFromHeaders(context.request.headers);
  }

  const need = rule?.need ?? 'signed-in';
  if (need === 'public') return next();

  const grants = context.locals.user?.permissions ?? (context.locals.station ? STATION_GRANTS : null);
  if (!grants) {
    if (isApi) return json({ error: { code: 'unauthenticated', message: 'Sign in first: this needs an account.' } }, 401);
    return context.redirect(`/sign-in?next=${encodeURIComponent(pathname + context.url.search)}`);
  }
  if (!allows(need, grants)) {
    const needText = typeof need === 'string' ? need : need.anyOf.join(' or ');
    if (isApi) {
      return json({ error: { code: 'forbidden', message: `Your roles do not allow this (it needs ${needText}).`, missing: needText } }, 403);
    }
    return context.rewrite(new Request(new URL(`/not-for-your-role?need=${encodeURIComponent(needText)}`, context.url), { headers: context.request.headers }));
  }
  return next();
});
