/** A signed-in session over real HTTP (for a child app process): its cookie and CSRF token. */
export interface HttpSession {
  baseUrl: string;
  cookie: string;
  csrfToken: string;
}

const cookieOf = (res: Response, fallback: string) => {
  const set = res.headers.getSetCookie().map((c) => c.split(';')[0]!);
  return set.length ? set.join('; ') : fallback;
};

export async function signInOverHttp(baseUrl: string, email: string, password: string): Promise<HttpSession> {
  const first = await fetch(`${baseUrl}/api/auth/session`);
  const { csrfToken } = (await first.json()) as { csrfToken: string };
  const cookie = cookieOf(first, '');
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie, 'x-csrf-token': csrfToken },
    body: JSON.stringify({ email, password }),
  });
  const body = (await res.json()) as { csrfToken?: string };
  if (res.status !== 200 || !body.csrfToken) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(body)}`);
  return { baseUrl, cookie: cookieOf(res, cookie), csrfToken: body.csrfToken };
}

/** Headers for a state-changing JSON request in this session. */
export function writeHeaders(s: HttpSession, extra: Record<string, string> = {}): Record<string, string> {
  return { 'content-type': 'application/json', cookie: s.cookie, 'x-csrf-token': s.csrfToken, ...extra };
}
