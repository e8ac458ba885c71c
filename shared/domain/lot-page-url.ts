/** A lot's public code: base64url of at least 16 random bytes (128 bits) is 22 characters or more. */
export const PUBLIC_CODE_PATTERN = /^[A-Za-z0-9_-]{22,64}$/;

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '[::1]']);

/**
 * The URL a label's QR code opens: `${base}/lot/<publicCode>`. Only https:, or plain http on a loopback
 * host for the local demo; anything else (javascript:, data:, http on a real host) throws.
 */
export function lotPageUrl(publicBaseUrl: string, publicCode: string): string {
  const base = new URL(publicBaseUrl);
  const isLoopbackHttp = base.protocol === 'http:' && LOOPBACK.has(base.hostname);
  if (base.protocol !== 'https:' && !isLoopbackHttp) throw new Error('The public address must use https:// (plain http only on this computer for the demo).');
  if (!PUBLIC_CODE_PATTERN.test(publicCode)) throw new Error('That public code is not valid.');
  return `${base.origin}${base.pathname.replace(/\/+$/, '')}/lot/${publicCode}`;
}
