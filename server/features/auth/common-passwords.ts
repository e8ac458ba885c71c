import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

// A shipped list of commonly used passwords (one per line, lower-case; its header names the source),
// checked on every new password (A5-6.2.4: at least the top 3,000).
let list: Set<string> | undefined;
export function isCommonPassword(password: string): boolean {
  list ??= new Set(
    readFileSync(fileURLToPath(new URL('./common-passwords.txt', import.meta.url)), 'utf8')
      .split('\n')
      .map((l) => l.trim().toLowerCase())
      .filter((l) => l && !l.startsWith('#')),
  );
  return list.has(password.toLowerCase());
}
