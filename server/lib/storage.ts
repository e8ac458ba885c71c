import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import fsp from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';

/**
 * Where uploaded files live. Local disk now (outside the web root, random names); an object-storage
 * implementation can replace it without touching features.
 */
export interface FileStorage {
  put(bytes: Buffer): Promise<string>;
  open(key: string): Promise<Readable>;
  remove(key: string): Promise<void>;
  exists(key: string): Promise<boolean>;
}

const KEY_PATTERN = /^[0-9a-f-]{36}$/;

export function localDiskStorage(root: string): FileStorage {
  const full = (key: string) => {
    if (!KEY_PATTERN.test(key)) throw new Error('invalid storage key');
    return path.join(root, key.slice(0, 2), key);
  };
  return {
    async put(bytes) {
      const key = randomUUID();
      const file = full(key);
      await fsp.mkdir(path.dirname(file), { recursive: true, mode: 0o700 });
      // Write to a temporary name, then rename: a crash never leaves a partial file under a real key.
      const tmp = `${file}.part`;
      await fsp.writeFile(tmp, bytes, { mode: 0o600 });
      await fsp.rename(tmp, file);
      return key;
    },
    async open(key) {
      await fsp.access(full(key));
      return fs.createReadStream(full(key));
    },
    async remove(key) {
      await fsp.rm(full(key), { force: true });
    },
    async exists(key) {
      return fsp.access(full(key)).then(() => true, () => false);
    },
  };
}

/** Removes *.part files a crash left behind (called at start). */
export async function sweepPartialUploads(root: string): Promise<number> {
  let removed = 0;
  const dirs = await fsp.readdir(root).catch(() => [] as string[]);
  for (const d of dirs) {
    const files = await fsp.readdir(path.join(root, d)).catch(() => [] as string[]);
    for (const f of files) if (f.endsWith('.part')) { await fsp.rm(path.join(root, d, f), { force: true }); removed += 1; }
  }
  return removed;
}
