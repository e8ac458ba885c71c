import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

// A shipped list of commonly used passwords (one per line, lower-case), checked on every new password.
let list: Set<string> | undefined;
export function isCommonPassword(password: string): boolean {
  list ??= new Set(
    readFileSync(fileURLToPath(new URL('./common-passwords.txt', import.meta.url)), 'utf8')
      .split('\n')
      .map((l) => l.trim().toLowerCase())
      .filter(Boolean),
  );
  return list.has(password.toLowerCase());
}
