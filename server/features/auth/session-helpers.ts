import { randomBytes } from 'node:crypto';
import type { Request } from 'express';

export const newToken = (bytes = 32) => randomBytes(bytes).toString('base64url');

/** A new session id at every sign-in (A5-7.2.4): the pre-sign-in id is thrown away. */
export function regenerateSession(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));
}
export function saveSession(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.save((err) => (err ? reject(err) : resolve())));
}
export function destroySession(req: Request): Promise<void> {
  return new Promise((resolve) => (req.session ? req.session.destroy(() => resolve()) : resolve()));
}

/** Makes sure an (anonymous) session carries a CSRF token, so even the sign-in POST is protected. */
export function ensureCsrfToken(req: Request): string {
  req.session.csrfToken ??= newToken();
  return req.session.csrfToken;
}

const userAgentOf = (req: Request) => (req.get('user-agent') ?? '').slice(0, 200);

/** Starts a member session under a new id with a new CSRF token (sign-in, sign-up, accepted invite). */
export async function startMemberSession(req: Request, member: { userId: string; businessId: string }, now: Date): Promise<void> {
  await regenerateSession(req);
  Object.assign(req.session, {
    kind: 'member',
    userId: member.userId,
    businessId: member.businessId,
    createdAt: now.getTime(),
    lastSeenAt: now.getTime(),
    userAgent: userAgentOf(req),
  });
  ensureCsrfToken(req);
  await saveSession(req);
}

/**
 * Re-issues the current session under a new id, keeping its contents but not its CSRF token
 * (after a password change: A5-7.2.4).
 */
export async function reissueSession(req: Request): Promise<void> {
  const { cookie: _cookie, csrfToken: _csrf, ...data } = req.session;
  await regenerateSession(req);
  Object.assign(req.session, data);
  ensureCsrfToken(req);
  await saveSession(req);
}

/** Starts a long-lived kitchen-device session (no person: userId stays unset). */
export async function startDeviceSession(req: Request, device: { id: string; businessId: string }, now: Date, lifetimeMs: number): Promise<void> {
  await regenerateSession(req);
  Object.assign(req.session, {
    kind: 'device',
    deviceId: device.id,
    businessId: device.businessId,
    createdAt: now.getTime(),
    lastSeenAt: now.getTime(),
    userAgent: userAgentOf(req),
  });
  req.session.cookie.maxAge = lifetimeMs;
  ensureCsrfToken(req);
  await saveSession(req);
}
