import type { RequestHandler } from 'express';
import { HttpError } from '../lib/http-error';
import type { Role } from '../../shared/contracts/auth';

/** Who may call a route: member roles, an enrolled kitchen device, an inspector link, or anyone. */
export type Audience = Role | 'device' | 'inspector' | 'public';

export type AccessHandler = RequestHandler & { access: readonly Audience[] };

/**
 * The one access check every route starts with. The route × audience table in docs/access-matrix.json
 * is compared with these declarations by a test, so a route without one (or not in the table) fails.
 */
export function allow(...audience: Audience[]): AccessHandler {
  const handler: RequestHandler = (req, _res, next) => {
    if (audience.includes('public')) return next();
    const actor = req.actor;
    if (!actor) return next(new HttpError(401, 'unauthenticated', 'Please sign in to continue.'));
    const who: Audience = actor.kind === 'member' ? (actor.role as Role) : actor.kind;
    if (audience.includes(who)) return next();
    return next(new HttpError(403, 'forbidden', 'Your role may not do that.'));
  };
  return Object.assign(handler, { access: audience });
}

export const MEMBERS: Audience[] = ['owner', 'baker', 'helper'];
export const EDITORS: Audience[] = ['owner', 'baker'];
