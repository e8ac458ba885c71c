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
