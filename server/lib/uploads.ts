import multer, { MulterError } from 'multer';
import { fileTypeFromBuffer } from 'file-type';
import type { RequestHandler, Response } from 'express';
import type { Readable } from 'node:stream';
import { HttpError } from './http-error';

export type AllowedKind = 'jpg' | 'png' | 'webp' | 'pdf';
const MIME: Record<AllowedKind, string> = { jpg: 'image/jpeg', png: 'image/png', webp: 'image/webp', pdf: 'application/pdf' };

export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;

/**
 * multer in memory with every limit set explicitly (busboy's defaults are unlimited). Memory storage
 * means an aborted upload leaves nothing on disk.
 */
export function singleFileUpload(field = 'file', maxBytes = MAX_UPLOAD_BYTES): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    // Browsers send UTF-8 file names without a charset parameter; busboy's default would read them as latin1.
    defParamCharset: 'utf8',
    limits: { fileSize: maxBytes, files: 1, fields: 10, parts: 12, fieldSize: 10_000, headerPairs: 100 },
  }).single(field);
  // A malformed multipart body (bad part header, truncated boundary) is the sender's mistake: 400, not 500.
  return (req, res, next) => upload(req, res, (err?: unknown) => {
    if (!err || err instanceof MulterError || err instanceof HttpError) return next(err);
    next(new HttpError(400, 'validation_failed', 'The upload could not be read. Choose the file again and retry.', { file: ['The upload could not be read.'] }));
  });
}

export interface CheckedFile {
  bytes: Buffer;
  kind: AllowedKind;
  contentType: string;
  /** A safe display name: the user's name cleaned, with the extension of the detected type. */
  displayName: string;
}

/**
 * Accepts a file only when its content (magic bytes) is one of the allowed kinds, whatever its name or
 * claimed type says; the stored name is never the user's.
 */
export async function checkUploadedFile(file: Express.Multer.File | undefined, allowed: readonly AllowedKind[]): Promise<CheckedFile> {
  if (!file) throw new HttpError(400, 'validation_failed', 'Choose a file to upload.', { file: ['Choose a file to upload.'] });
  if (file.size === 0) throw new HttpError(400, 'validation_failed', 'That file is empty.', { file: ['That file is empty.'] });
  const detected = await fileTypeFromBuffer(file.buffer);
  const kind = detected?.ext as AllowedKind | undefined;
  const allowedText = allowed.map((k) => k.toUpperCase()).join(', ');
  if (!kind || !allowed.includes(kind)) {
    throw new HttpError(415, 'unsupported_media_type', `Only ${allowedText} files are accepted; this file is not one, whatever its name says.`, { file: [`Upload a ${allowedText} file.`] });
  }
  if (kind === 'pdf' && /\/JavaScript|\/JS\s|\/Launch|\/EmbeddedFile/.test(file.buffer.toString('latin1'))) {
    throw new HttpError(415, 'unsupported_media_type', 'PDFs with scripts or embedded files are not accepted.', { file: ['Save the label as a plain PDF or a photo and try again.'] });
  }
  return { bytes: file.buffer, kind, contentType: MIME[kind], displayName: safeDisplayName(file.originalname, kind) };
}

/** Strips paths, control characters and odd punctuation from a user's file name; inner dots become "_" so no double extension survives. */
export function safeDisplayName(original: string, kind: AllowedKind): string {
  // eslint-disable-next-line no-control-regex -- stripping control characters is the point
  const base = (original.split(/[\\/]/).pop() ?? '').replace(/[\u0000-\u001f\u007f]/g, '');
  const stem = base.replace(/\.[^.]*$/, '').replace(/[^\p{L}\p{N} _().-]/gu, '').replace(/\./g, '_').trim().slice(0, 80);
  return `${stem || 'file'}.${kind === 'jpg' ? 'jpg' : kind}`;
}

/** Serves a stored file so it can never run in the app's origin (attachment, nosniff, sandbox CSP). */
export function sendStoredFile(res: Response, stream: Readable, file: { contentType: string; displayName: string; byteSize?: number }, inline = false) {
  const ascii = file.displayName.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  res.set({
    'Content-Type': file.contentType,
    'Content-Disposition': `${inline ? 'inline' : 'attachment'}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(file.displayName)}`,
    'X-Content-Type-Options': 'nosniff',
    'Content-Security-Policy': "sandbox; default-src 'none'; img-src 'self'; style-src 'unsafe-inline'",
    'Cache-Control': 'private, no-store',
    'Cross-Origin-Resource-Policy': 'same-origin',
  });
  if (file.byteSize) res.set('Content-Length', String(file.byteSize));
  stream.pipe(res);
}
