import { createHash } from 'node:crypto';
import { once } from 'node:events';
import { PassThrough, type Writable } from 'node:stream';
import { ZipArchive } from 'archiver';

export interface PacketFile {
  name: string;
  bytes: number;
  sha256: string;
  rows: number | null;
}

/** The client went away: stop reading the database. */
export class PacketAborted extends Error {
  constructor() {
    super('The download was cancelled.');
  }
}

/**
 * A zip streamed to `out` one entry at a time (archiver 8, deflate level 9), with the SHA-256 and
 * size of each file computed from the bytes as they are written. Writes wait for the reader
 * (backpressure), so a slow download never piles the packet up in memory.
 */
export class PacketZip {
  readonly files: PacketFile[] = [];
  private readonly archive = new ZipArchive({ zlib: { level: 9 } });
  private failure: Error | null = null;
  private closed = false;
  private readonly outClosed: Promise<unknown>;

  constructor(private readonly out: Writable, private readonly modifiedAt: Date) {
    this.archive.on('error', (err: Error) => (this.failure = err));
    this.archive.on('warning', (err: Error) => (this.failure = err));
    this.outClosed = once(out, 'close').then(() => (this.closed = true));
    this.archive.pipe(out);
  }

  /** Bytes of zip written so far. */
  get bytesWritten(): number {
    return this.archive.pointer();
  }

  private check(): void {
    if (this.failure) throw this.failure;
    if (this.closed || this.out.destroyed) throw new PacketAborted();
  }

  /** Adds one file whose content `produce` writes in chunks; returns when the zip has taken it all. */
  async addStreamed(name: string, produce: (write: (chunk: string | Uint8Array) => Promise<void>) => Promise<number | null>): Promise<PacketFile> {
    this.check();
    const hash = createHash('sha256');
    let bytes = 0;
    const entry = new PassThrough();
    const done = once(this.archive, 'entry');
    this.archive.append(entry, { name, date: this.modifiedAt });
    const write = async (chunk: string | Uint8Array) => {
      const buf = typeof chunk === 'string' ? Buffer.from(chunk, 'utf8') : chunk;
      if (!buf.length) return;
      hash.update(buf);
      bytes += buf.length;
      if (!entry.write(buf)) await Promise.race([once(entry, 'drain'), this.outClosed]);
      this.check();
    };
    let rows: number | null;
    try {
      rows = await produce(write);
    } catch (err) {
      entry.destroy();
      throw err;
    }
    entry.end();
    await Promise.race([done, this.outClosed]);
    this.check();
    const file = { name, bytes, sha256: hash.digest('hex'), rows };
    this.files.push(file);
    return file;
  }

  async addBytes(name: string, content: string | Uint8Array, rows: number | null = null): Promise<PacketFile> {
    return this.addStreamed(name, async (write) => {
      await write(content);
      return rows;
    });
  }

  async finalize(): Promise<void> {
    this.check();
    await this.archive.finalize();
  }

  /** Stops the zip after a failure; the download ends incomplete rather than looking whole. */
  abort(): void {
    const started = this.archive.pointer() > 0;
    this.archive.unpipe(this.out);
    this.archive.abort();
    if (started) this.out.destroy();
  }
}
