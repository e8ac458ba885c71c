import { beforeAll, describe, expect, test } from 'vitest';
import http from 'node:http';
import fs from 'node:fs';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents, type ApiAgent } from '../support/agents';
import { ingredientLabelFiles } from '../../server/db/schema/ingredients';
import { drawLabelPng, drawSpecSheetPdf } from '../../server/db/seed/label-images';
import { MAX_LABEL_FILES_PER_INGREDIENT } from '../../shared/contracts/ingredients';

const t = makeTestApp();
type Agents = Awaited<ReturnType<typeof businessWithAgents>>;
let a: Agents;
let other: Agents;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

// Magic numbers: JPEG SOI FF D8 FF (ISO/IEC 10918-1), PE "MZ", GIF "GIF89a"; common practice for sniffing.
const JPEG = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01]), Buffer.alloc(200, 0x20), Buffer.from([0xff, 0xd9])]);
const EXE = Buffer.concat([Buffer.from('MZ'), Buffer.alloc(58), Buffer.from([0x80, 0, 0, 0]), Buffer.alloc(64), Buffer.from('PE\0\0'), Buffer.alloc(300)]);
const SVG = Buffer.from('<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>');
const HTML = Buffer.from('<!doctype html><html><body><script>alert(document.cookie)</script></body></html>');
const GIF_JS_POLYGLOT = Buffer.from('GIF89a/*\x01\x00\x01\x00\x00\x00\x00*/=1;alert(document.domain);//');

let ingredientId: string;

async function newIngredient(agent: ApiAgent) {
  const res = await agent.post('/api/ingredients').send({ labelName: `Granulated sugar ${Math.random()}` });
  return res.body.id as string;
}
const upload = (agent: ApiAgent, id: string, bytes: Buffer, filename: string, contentType = 'image/jpeg') =>
  agent.post(`/api/ingredients/${id}/label-files`).attach('file', bytes, { filename, contentType });

function filesUnder(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { recursive: true, withFileTypes: true }).filter((d) => d.isFile()).map((d) => path.join(d.parentPath, d.name));
}

beforeAll(async () => {
  a = await businessWithAgents(t);
  other = await businessWithAgents(t);
  ingredientId = await newIngredient(a.owner);
});

describe('POST /api/ingredients/:id/label-files', () => {
  test.each([
    ['PNG photo', () => drawLabelPng('sugar'), 'sugar.png', 'image/png'],
    ['JPEG photo', () => JPEG, 'IMG_0042.jpg', 'image/jpeg'],
    ['PDF spec sheet', () => drawSpecSheetPdf('Granulated sugar', ['Ingredients: sugar']), 'spec.pdf', 'application/pdf'],
  ])('a valid %s answers 201, stored under a UUID outside the static dir', async (_n, make, filename, type) => {
    const bytes = await make();
    const res = await upload(a.baker, ingredientId, bytes, filename);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ contentType: type, byteSize: bytes.length, isImage: type.startsWith('image/') });
    const [row] = await t.db.select().from(ingredientLabelFiles).where(eq(ingredientLabelFiles.id, res.body.id));
    expect(row!.storageKey).toMatch(UUID);
    const stored = path.join(t.config.uploadDir, row!.storageKey.slice(0, 2), row!.storageKey);
    expect(fs.readFileSync(stored).equals(bytes)).toBe(true);
  });

  test.each([
    ['an executable renamed .jpg', EXE, 'photo.jpg'],
    ['an SVG with a script', SVG, 'label.svg'],
    ['an HTML page', HTML, 'label.html'],
    ['a GIF/JavaScript polyglot', GIF_JS_POLYGLOT, 'label.jpg'],
  ])('%s answers 415 with a clear message and stores nothing', async (_n, bytes, filename) => {
    const before = filesUnder(t.config.uploadDir).length;
    const res = await upload(a.owner, ingredientId, bytes, filename);
    expect(res.status).toBe(415);
    expect(res.body.error.message).toMatch(/JPG, PNG, WEBP, PDF/);
    expect(filesUnder(t.config.uploadDir)).toHaveLength(before);
  });

  test('a PDF carrying JavaScript answers 415', async () => {
    const pdf = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog /OpenAction << /S /JavaScript /JS (app.alert(1)) >> >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF');
    expect((await upload(a.owner, ingredientId, pdf, 'spec.pdf', 'application/pdf')).status).toBe(415);
  });

  test('a file over 10 MB answers 413', async () => {
    const big = Buffer.concat([drawLabelPng('big'), Buffer.alloc(10 * 1024 * 1024)]);
    const res = await upload(a.owner, ingredientId, big, 'big.png', 'image/png');
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
  });

  test('two files in one request answer 400', async () => {
    const res = await a.owner.post(`/api/ingredients/${ingredientId}/label-files`)
      .attach('file', drawLabelPng('a'), 'a.png').attach('file', drawLabelPng('b'), 'b.png');
    expect(res.status).toBe(400);
  });

  test('`../`, NUL and double extensions in the name: the stored name is a UUID and the display name is cleaned', async () => {
    const id = await newIngredient(a.owner);
    const traversal = await upload(a.owner, id, drawLabelPng('x'), '../../../etc/passwd.png', 'image/png');
    expect(traversal.status).toBe(201);
    expect(traversal.body.displayName).toBe('passwd.png');
    const doubled = await upload(a.owner, id, drawLabelPng('y'), 'label.jpg.php', 'image/png');
    expect(doubled.body.displayName).toBe('label_jpg.png');
    const nul = await upload(a.owner, id, drawLabelPng('z'), 'evil\u0000.php.png', 'image/png');
    expect([201, 400]).toContain(nul.status);
    // eslint-disable-next-line no-control-regex -- the NUL byte is what is being checked
    if (nul.status === 201) expect(nul.body.displayName).not.toMatch(/[\u0000/\\]|\.php/);
    const rows = await t.db.select().from(ingredientLabelFiles).where(eq(ingredientLabelFiles.ingredientId, id));
    for (const r of rows) expect(r.storageKey).toMatch(UUID);
  });

  test(`more than ${MAX_LABEL_FILES_PER_INGREDIENT} files on one ingredient answers 400 with the limit in the message`, async () => {
    const id = await newIngredient(a.owner);
    for (let i = 0; i < MAX_LABEL_FILES_PER_INGREDIENT; i++) expect((await upload(a.owner, id, drawLabelPng(`n${i}`), `n${i}.png`)).status).toBe(201);
    const res = await upload(a.owner, id, drawLabelPng('extra'), 'extra.png');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(String(MAX_LABEL_FILES_PER_INGREDIENT));
    expect(await t.db.select().from(ingredientLabelFiles).where(eq(ingredientLabelFiles.ingredientId, id))).toHaveLength(MAX_LABEL_FILES_PER_INGREDIENT);
  });

  test('a helper answers 403, anonymous 401, another business 404', async () => {
    expect((await upload(a.helper, ingredientId, drawLabelPng('h'), 'h.png')).status).toBe(403);
    await a.anonymous.refreshCsrf();
    expect((await upload(a.anonymous, ingredientId, drawLabelPng('h'), 'h.png')).status).toBe(401);
    expect((await upload(other.owner, ingredientId, drawLabelPng('h'), 'h.png')).status).toBe(404);
  });

  test('an upload aborted midway leaves no file and no row', async () => {
    const id = await newIngredient(a.owner);
    const before = filesUnder(t.config.uploadDir);
    const server = http.createServer(t.app).listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    const { port } = server.address() as AddressInfo;
    const cookie = (a.owner.agent as unknown as { jar: { getCookies(o: object): { toValueString(): string } } }).jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false }).toValueString();
    const boundary = 'ctboundary42';
    const head = Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="half.png"\r\nContent-Type: image/png\r\n\r\n`);
    const headers = (length: number) => ({ 'Content-Type': `multipart/form-data; boundary=${boundary}`, 'Content-Length': String(length), Cookie: cookie, 'X-CSRF-Token': a.owner.csrfToken, Origin: 'http://127.0.0.1' });
    // The same credentials complete a whole upload, so the aborted one below really reached the upload parser.
    const whole = Buffer.concat([head, drawLabelPng('whole'), Buffer.from(`\r\n--${boundary}--\r\n`)]);
    const wholeStatus = await new Promise<number>((resolve, reject) => {
      const req = http.request({ host: '127.0.0.1', port, method: 'POST', path: `/api/ingredients/${id}/label-files`, headers: headers(whole.length) }, (res) => { res.resume(); resolve(res.statusCode!); });
      req.on('error', reject);
      req.end(whole);
    });
    expect(wholeStatus).toBe(201);
    const afterWhole = filesUnder(t.config.uploadDir);
    await new Promise<void>((resolve) => {
      const req = http.request({ host: '127.0.0.1', port, method: 'POST', path: `/api/ingredients/${id}/label-files`, headers: headers(head.length + 5_000_000) });
      req.on('error', () => resolve());
      req.write(head);
      req.write(Buffer.concat([drawLabelPng('half'), Buffer.alloc(1_000_000)]), () => setTimeout(() => { req.destroy(); resolve(); }, 100));
    });
    await new Promise((r) => setTimeout(r, 300));
    server.close();
    expect(afterWhole).toHaveLength(before.length + 1);
    expect(filesUnder(t.config.uploadDir)).toEqual(afterWhole);
    expect(await t.db.select().from(ingredientLabelFiles).where(eq(ingredientLabelFiles.ingredientId, id))).toHaveLength(1);
  });
});

describe('GET label file download and view', () => {
  test('download: attachment with RFC 6266 filename, nosniff, detected type, sandbox CSP, the same bytes', async () => {
    const bytes = drawLabelPng('download');
    const up = await upload(a.owner, ingredientId, bytes, 'Crème "label".png', 'application/octet-stream');
    const res = await a.helper.get(`/api/ingredients/${ingredientId}/label-files/${up.body.id}/download`).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = []; r.on('data', (c: Buffer) => chunks.push(c)); r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/png');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="Cr_me label.png"; filename*=UTF-8''Cr%C3%A8me%20label.png`);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toMatch(/^sandbox/);
    expect((res.body as Buffer).equals(bytes)).toBe(true);
  });

  test('view: images inline, PDFs still an attachment', async () => {
    const png = await upload(a.owner, ingredientId, drawLabelPng('inline'), 'inline.png');
    const pdf = await upload(a.owner, ingredientId, await drawSpecSheetPdf('Spec', ['x']), 'spec.pdf');
    expect((await a.owner.get(`/api/ingredients/${ingredientId}/label-files/${png.body.id}/view`)).headers['content-disposition']).toMatch(/^inline;/);
    expect((await a.owner.get(`/api/ingredients/${ingredientId}/label-files/${pdf.body.id}/view`)).headers['content-disposition']).toMatch(/^attachment;/);
  });

  test('anonymous answers 401, another business 404, a cross-site fetch 403', async () => {
    const up = await upload(a.owner, ingredientId, drawLabelPng('private'), 'private.png');
    const url = `/api/ingredients/${ingredientId}/label-files/${up.body.id}/download`;
    expect((await a.anonymous.get(url)).status).toBe(401);
    expect((await other.owner.get(url)).status).toBe(404);
    expect((await other.owner.get(`/api/ingredients/${ingredientId}/label-files`)).status).toBe(404);
    expect((await a.owner.get(url).set('Sec-Fetch-Site', 'cross-site')).status).toBe(403);
  });

  test('the list shows each file with who uploaded it', async () => {
    const res = await a.helper.get(`/api/ingredients/${ingredientId}/label-files`);
    expect(res.status).toBe(200);
    expect(res.body.limit).toBe(MAX_LABEL_FILES_PER_INGREDIENT);
    expect(res.body.items.length).toBeGreaterThan(0);
    expect(res.body.items.every((f: { displayName: string }) => !f.displayName.includes('/'))).toBe(true);
  });
});
