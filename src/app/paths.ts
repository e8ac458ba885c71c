/** Every client path in one place; build links with these, never by hand. */
export const paths = {
  kitchen: '/',
  batches: '/batches',
  batchNew: '/batches/new',
  recipes: '/recipes',
  ingredients: '/ingredients',
  cleaning: '/cleaning',
  labels: '/labels',
  records: '/records',
  trace: '/trace',
  sales: '/sales',
  team: '/team',
  settings: '/settings',
  sentMail: '/sent-mail',
  account: '/account',
  inspector: '/inspector',
  signIn: '/sign-in',
  signUp: '/sign-up',
  join: '/join',
} as const;

/** Sign-in with a safe same-site `next` to come back to. */
export function signInPath(next?: string, reason?: 'expired' | 'signed-out'): string {
  const q = new URLSearchParams();
  if (next && next !== paths.kitchen && isSafeNext(next)) q.set('next', next);
  if (reason) q.set('reason', reason);
  const s = q.toString();
  return s ? `${paths.signIn}?${s}` : paths.signIn;
}

/** Only same-site absolute paths (no "//host" or scheme) may be used as a redirect target. */
export function isSafeNext(next: string | null | undefined): next is string {
  return !!next && next.startsWith('/') && !next.startsWith('//') && !next.startsWith('/\\');
}

/** The page of one batch. */
export const batchPath = (id: string) => `/batches/${id}`;
