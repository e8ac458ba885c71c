import { createRequire } from 'node:module';
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import { performance } from 'node:perf_hooks';
import { Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { desc, eq } from 'drizzle-orm';
import { to as copyTo } from 'pg-copy-streams';
import { createDb, createPool } from '../../server/db/client';
import { signUp } from '../../server/features/auth/auth.service';
import { listBatches } from '../../server/features/batches/batches.service';
import { writeCsv } from '../../server/features/records/audit-packet.service';
import { packetTables, useBusinessZone } from '../../server/features/records/audit-packet-tables';
import { recordEvents } from '../../server/db/schema/record-events';
import { hashEntry, GENESIS_HASH, type ChainEntry } from '../../shared/domain/record-chain';
import { ListBatchesQuerySchema } from '../../shared/contracts/batches';
import { createBatch, createSimpleRecipe } from '../support/factories';
import { labelledBatch, setBusinessContact } from '../support/label-batches';
import { startChildServer, type ChildServer } from '../support/app-process';
import { signInOverHttp, writeHeaders, type HttpSession } from '../support/http-session';
import type { TestApp } from '../support/app';
import type { Actor } from '../../server/lib/actor';

// npm run bench: every figure is a ratio against a baseline measured in the same run, on loopback,
// bounded in time, after a warm-up. Writes .data/bench/latest.json.
interface CannonResult {
  requests: { average: number; stddev: number; total: number };
  latency: { p50: number; p90: number; p97_5: number; p99: number; max: number };
  throughput: { average: number };
  errors: number; timeouts: number; non2xx: number;
}
type Cannon = (opts: Record<string, unknown>) => Promise<CannonResult>;
const autocannon = createRequire(import.meta.url)('autocannon') as Cannon;

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const WARMUP_SECONDS = Number(process.env.BENCH_WARMUP_SECONDS ?? 3);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);
const PASSWORD = 'bench horse battery staple';
const adminUrl = process.env.BENCH_ADMIN_URL ?? process.env.MIGRATION_DATABASE_URL;
if (!adminUrl) throw new Error('Run through npm run bench (BENCH_ADMIN_URL is not set)');
const serverCpu = os.cpus().length >= 2 ? 0 : undefined;
const dbName = `bench_${process.pid}_${Date.now()}`;
const withDb = (url: string, name: string, user?: string) => {
  const u = new URL(url);
  u.pathname = `/${name}`;
  if (user) { u.username = user; u.password = user; }
  return u.toString();
};
const ownerUrl = withDb(adminUrl, dbName);
const runtimeUrl = withDb(adminUrl, dbName, process.env.RUNTIME_USER ?? 'crumbtrail_app');
const children: ChildServer[] = [];
const round = (n: number, d = 2) => Math.round(n * 10 ** d) / 10 ** d;
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const log = (m: string) => process.stderr.write(`${m}\n`);

async function load(url: string, opts: { headers?: Record<string, string>; overallRate?: number; seconds?: number } = {}) {
  const base = { url, connections: CONNECTIONS, headers: opts.headers ?? {}, ...(opts.overallRate ? { overallRate: opts.overallRate } : {}) };
  await autocannon({ ...base, duration: WARMUP_SECONDS });
  const r = await autocannon({ ...base, duration: opts.seconds ?? SECONDS });
  return {
    reqPerSec: round(r.requests.average), reqPerSecStddev: round(r.requests.stddev), p50: r.latency.p50, p90: r.latency.p90,
    p97_5: r.latency.p97_5, p99: r.latency.p99, max: r.latency.max, errors: r.errors, timeouts: r.timeouts, non2xx: r.non2xx,
  };
}

/** Peak resident memory of a process while `work` runs, sampled every 10 ms from /proc. */
async function peakRss<T>(pid: number, work: () => Promise<T>): Promise<{ result: T; peakMb: number }> {
  const rss = () => Number(/VmRSS:\s+(\d+)/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? 0) / 1024;
  let peak = rss();
  const timer = setInterval(() => { peak = Math.max(peak, rss()); }, 10);
  try {
    const result = await work();
    return { result, peakMb: round(Math.max(peak, rss()), 1) };
  } finally {
    clearInterval(timer);
  }
}

async function postTimed(session: HttpSession, url: string, body: object) {
  const t0 = performance.now();
  const res = await fetch(`${session.baseUrl}${url}`, { method: 'POST', headers: writeHeaders(session), body: JSON.stringify(body) });
  const bytes = (await res.arrayBuffer()).byteLength;
  if (res.status >= 300) throw new Error(`${url}: ${res.status}`);
  return { ms: performance.now() - t0, bytes };
}

async function setUpDatabase() {
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  await admin.query(`CREATE DATABASE "${dbName}"`);
  await admin.end();
  const pool = new pg.Pool({ connectionString: ownerUrl, max: 2 });
  await migrate(drizzle({ client: pool, casing: 'snake_case' }), { migrationsFolder: 'drizzle' });
  await pool.end();
}

async function dropDatabase() {
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  await admin.query(`DROP DATABASE IF EXISTS "${dbName}" WITH (FORCE)`);
  await admin.end();
}

/** Appends `count` synthetic record events with a valid chain, in bulk (the packet reads them; nothing else does). */
async function addRecordEvents(db: ReturnType<typeof createDb>, actor: Actor, count: number, now: Date) {
  const [head] = await db.select().from(recordEvents).where(eq(recordEvents.businessId, actor.businessId)).orderBy(desc(recordEvents.seq)).limit(1);
  let seq = head?.seq ?? 0;
  let prev = head?.hash ?? GENESIS_HASH;
  for (let done = 0; done < count; done += 1000) {
    const rows = [];
    for (let i = 0; i < Math.min(1000, count - done); i++) {
      seq += 1;
      const at = new Date(now.getTime() - (count - done - i) * 1000).toISOString();
      const entry: ChainEntry = {
        businessId: actor.businessId, seq, actorUserId: actor.userId, actorName: actor.name, actorRole: actor.role, entityType: 'bench',
        entityId: crypto.randomUUID(), action: 'note', payload: { note: `Synthetic event ${seq}`, grams: '12.5' }, reason: null,
        occurredAt: at, recordedAt: at, idempotencyKey: null, prevHash: prev,
      };
      prev = hashEntry(entry);
      rows.push({ ...entry, occurredAt: new Date(at), recordedAt: new Date(at), hash: prev, requestId: null });
    }
    await db.insert(recordEvents).values(rows);
  }
}

async function bundleSizes() {
  const out = fs.mkdtempSync(path.join(os.tmpdir(), 'crumbtrail-bench-build-'));
  try {
    const built = spawnSync('node_modules/.bin/vite', ['build', '--logLevel', 'error'], { env: { ...process.env, VITE_OUT_DIR: out }, encoding: 'utf8' });
    if (built.status !== 0) throw new Error(`vite build failed: ${built.stderr}`);
    const html = fs.readFileSync(path.join(out, 'index.html'), 'utf8');
    const gz = (rel: string) => zlib.gzipSync(fs.readFileSync(path.join(out, rel)), { level: 9 }).length;
    const refs = (re: RegExp) => [...html.matchAll(re)].map((m) => m[1]!.replace(/^\//, ''));
    // The shell is what index.html loads up front: the entry script and its preloaded imports.
    const shellFiles = [...new Set([...refs(/<script[^>]+src="([^"]+\.js)"/g), ...refs(/<link[^>]+rel="modulepreload"[^>]+href="([^"]+)"/g)])];
    const cssFiles = refs(/<link[^>]+rel="stylesheet"[^>]+href="([^"]+\.css)"/g);
    const assets = fs.readdirSync(path.join(out, 'assets')).map((f) => `assets/${f}`);
    const chunks = assets.filter((f) => f.endsWith('.js') && !shellFiles.includes(f)).map((f) => ({ file: path.basename(f), gzipKb: round(gz(f) / 1024, 1) }));
    return {
      shellGzipKb: round(shellFiles.reduce((n, f) => n + gz(f), 0) / 1024, 1),
      cssGzipKb: round([...cssFiles, ...assets.filter((f) => f.endsWith('.css') && !cssFiles.includes(f))].reduce((n, f) => n + gz(f), 0) / 1024, 1),
      largestRouteChunkGzipKb: Math.max(0, ...chunks.map((c) => c.gzipKb)),
      routeChunks: chunks.sort((a, b) => b.gzipKb - a.gzipKb),
    };
  } finally {
    fs.rmSync(out, { recursive: true, force: true });
  }
}

async function main() {
  const started = Date.now();
  log(`Benchmark database ${dbName}`);
  await setUpDatabase();
  const pool = createPool(runtimeUrl);
  const db = createDb(pool);
  const t = { db, clock: { now: new Date() } } as unknown as TestApp;
  try {
    // Data: one business, 60 batches (the list shows 50), one released labelled batch for the lot page and labels.
    const email = 'owner@bench.invalid';
    const owner = await signUp(db, { businessName: 'Bench Bakery', displayName: 'Bench Owner', email, password: PASSWORD });
    const actor: Actor = { kind: 'member', businessId: owner.businessId, userId: owner.userId, name: 'Bench Owner', role: 'owner' };
    await setBusinessContact(t, owner.businessId);
    const recipe = await createSimpleRecipe(t, owner.businessId, ['Flour', 'Sugar', 'Butter', 'Eggs']);
    const lots = recipe.ingredients.map((i) => ({ ingredientId: i.ingredient.id, supplierLotId: i.lot.id }));
    for (let i = 0; i < 60; i++) {
      const madeOn = new Date(Date.now() - (i % 30) * 86_400_000).toISOString().slice(0, 10);
      await createBatch(t, owner.businessId, { recipeVersionId: recipe.recipeVersion.id, madeOn, lots, quantityPieces: 24 }, actor);
    }
    const { batch } = await labelledBatch(t, owner.businessId, actor);

    const app = await startChildServer({ DATABASE_URL: runtimeUrl, LOT_PAGE_LIMIT: '100000000' }, { cpu: serverCpu });
    children.push(app);
    const session = await signInOverHttp(app.url, email, PASSWORD);
    const results: Record<string, unknown> = {};

    // 1. Public lot page vs express.static with the same bytes.
    log('Lot page...');
    const lotUrl = `${app.url}/lot/${batch.publicCode}`;
    const lotRes = await fetch(lotUrl);
    if (lotRes.status !== 200) throw new Error(`lot page answered ${lotRes.status}`);
    const lotHtml = Buffer.from(await lotRes.arrayBuffer());
    const staticDir = fs.mkdtempSync(path.join(os.tmpdir(), 'crumbtrail-bench-static-'));
    fs.writeFileSync(path.join(staticDir, 'lot.html'), lotHtml);
    const staticServer = await startChildServer({ BASELINE: 'static', STATIC_DIR: staticDir }, { entry: 'tests/bench/baseline-server.ts', cpu: serverCpu });
    children.push(staticServer);
    const lot = await load(lotUrl);
    const lotBase = await load(`${staticServer.url}/lot.html`);
    await staticServer.kill();
    results.lotPage = {
      bytes: lotHtml.length, gzipBytes: zlib.gzipSync(lotHtml).length, app: lot, baseline: lotBase,
      throughputRatio: round(lot.reqPerSec / lotBase.reqPerSec), p99Ratio: round(lot.p99 / Math.max(lotBase.p99, 1)),
      goals: { throughputRatio: '>= 0.5', bytes: '<= 14336' },
    };

    // 2. Signed-in list of 50 batches vs a bare Express + pg handler running the same SQL.
    log('Batch list...');
    const captured: { text: string; values: unknown[] }[] = [];
    const capturing = drizzle({ client: pool, casing: 'snake_case', logger: { logQuery: (text, values) => void captured.push({ text, values }) } });
    const page = await listBatches(capturing, actor, ListBatchesQuerySchema.parse({}));
    if ((page as { items?: unknown[] }).items?.length !== 50) log(`note: the list answered ${(page as { items?: unknown[] }).items?.length} rows`);
    const bare = await startChildServer({ BASELINE: 'bare', DATABASE_URL: runtimeUrl, QUERIES: JSON.stringify(captured) }, { entry: 'tests/bench/baseline-server.ts', cpu: serverCpu });
    children.push(bare);
    const listHeaders = { cookie: session.cookie };
    const list = await load(`${app.url}/api/batches`, { headers: listHeaders });
    const listBase = await load(`${bare.url}/batches`);
    // Same offered rate for both (open loop, latency corrected for coordinated omission): half the app's closed-loop rate.
    const rate = Math.max(10, Math.floor(list.reqPerSec / 2));
    const listAtRate = await load(`${app.url}/api/batches`, { headers: listHeaders, overallRate: rate });
    const baseAtRate = await load(`${bare.url}/batches`, { overallRate: rate });
    await bare.kill();
    results.batchList = {
      statements: captured.length, app: list, baseline: listBase, offeredRate: rate, appAtRate: listAtRate, baselineAtRate: baseAtRate,
      throughputRatio: round(list.reqPerSec / listBase.reqPerSec), p99RatioAtRate: round(listAtRate.p99 / Math.max(baseAtRate.p99, 1)),
      goals: { throughputRatio: '>= 0.4', p99RatioAtRate: '<= 2' },
    };

    // 3. Label sheet of 30 labels (time and bytes), against a sheet of one label.
    log('Label sheet...');
    const sheet = (count: number) => ({ batchId: batch.id, templateId: 'square-2in', count, sheet: { paper: 'letter' } });
    await postTimed(session, '/api/labels/print-runs', sheet(30));
    const thirty = [];
    const one = [];
    for (let i = 0; i < 5; i++) thirty.push(await postTimed(session, '/api/labels/print-runs', sheet(30)));
    for (let i = 0; i < 5; i++) one.push(await postTimed(session, '/api/labels/print-runs', sheet(1)));
    results.labelSheet = {
      labels30Ms: round(median(thirty.map((x) => x.ms))), labels30Bytes: thirty[0]!.bytes, labels1Ms: round(median(one.map((x) => x.ms))), labels1Bytes: one[0]!.bytes,
      timeRatio30To1: round(median(thirty.map((x) => x.ms)) / median(one.map((x) => x.ms))), goals: { labels30Bytes: '<= 61440' },
    };

    // 4. Audit packet at 1,000 and 100,000 record events: time, peak memory ratio, CSV part vs COPY.
    log('Audit packet (this adds 100,000 record events)...');
    const to = new Date().toISOString().slice(0, 10);
    const from = new Date(Date.now() - 1000 * 86_400_000).toISOString().slice(0, 10);
    const packet = async () => peakRss(app.child.pid!, () => postTimed(session, '/api/audit-packets', { from, to }));
    const have = (await pool.query('select count(*)::int as n from record_events where business_id = $1', [owner.businessId])).rows[0].n as number;
    await addRecordEvents(db, actor, Math.max(0, 1000 - have), new Date());
    await packet();
    const small = await packet();
    await addRecordEvents(db, actor, 99_000, new Date());
    const large = await packet();
    const csvVsCopy = await db.transaction(async (tx) => {
      await useBusinessZone(tx, 'America/Chicago');
      const table = packetTables({ businessId: owner.businessId, from, to, timeZone: 'America/Chicago' }).find((x) => x.file === 'record-events.csv')!;
      const t0 = performance.now();
      const rows = await writeCsv(tx, table, async () => undefined);
      return { rows, ms: performance.now() - t0 };
    });
    const client = await pool.connect();
    const c0 = performance.now();
    await pipeline(client.query(copyTo(`COPY (select * from record_events where business_id = '${owner.businessId}' order by seq) TO STDOUT WITH (FORMAT csv, HEADER)`)), new Writable({ write: (_c, _e, cb) => cb() }));
    const copyMs = performance.now() - c0;
    client.release();
    results.auditPacket = {
      events1kMs: round(small.result.ms), events1kBytes: small.result.bytes, events1kPeakRssMb: small.peakMb,
      events100kMs: round(large.result.ms), events100kBytes: large.result.bytes, events100kPeakRssMb: large.peakMb,
      peakMemoryRatio: round(large.peakMb / small.peakMb), csvRows: csvVsCopy.rows, csvPartMs: round(csvVsCopy.ms), copyMs: round(copyMs),
      csvVsCopyRatio: round(csvVsCopy.ms / copyMs), goals: { peakMemoryRatio: '<= 1.5', csvVsCopyRatio: '<= 5' },
    };

    // 5. Label-text engine at 200 and 2,000 leaves (the labels engineer's bench, one JSON line).
    log('Label engine...');
    const engine = execFileSync(process.execPath, ['--import', 'tsx', 'tests/bench/label-engine.bench.ts'], { encoding: 'utf8' }).trim().split('\n').pop()!;
    results.labelEngine = { ...JSON.parse(engine), goals: { ratio: '<= 15' } };

    // 6. Client bundle, gzip.
    log('Client bundle (vite build into a temp folder)...');
    results.bundle = { ...(await bundleSizes()), goals: { shellGzipKb: '<= 150', largestRouteChunkGzipKb: '<= 50', cssGzipKb: '<= 20' } };

    const pgVersion = (await pool.query('show server_version')).rows[0].server_version as string;
    const report = {
      at: new Date().toISOString(),
      machine: { cpus: os.cpus().length, cpuModel: os.cpus()[0]?.model, node: process.version, postgres: pgVersion, os: `${os.type()} ${os.release()}`, loadAverage: os.loadavg().map((x) => round(x)) },
      settings: { tool: 'autocannon 9.0.0', seconds: SECONDS, warmupSeconds: WARMUP_SECONDS, connections: CONNECTIONS, poolMax: 10, serverCpu: serverCpu ?? 'unpinned', loadGeneratorCpu: serverCpu === undefined ? 'unpinned' : 1 },
      results,
      totalSeconds: round((Date.now() - started) / 1000, 0),
    };
    fs.mkdirSync('.data/bench', { recursive: true });
    fs.writeFileSync('.data/bench/latest.json', `${JSON.stringify(report, null, 2)}\n`);
    printTable(report.results as Record<string, Record<string, unknown>>);
    console.log(`\nWritten to .data/bench/latest.json (${report.totalSeconds} s)`);
  } finally {
    for (const c of children) await c.kill().catch(() => undefined);
    await pool.end().catch(() => undefined);
    await dropDatabase();
  }
}

function printTable(r: Record<string, Record<string, unknown>>) {
  const rows: [string, string, string][] = [];
  const lp = r.lotPage!, bl = r.batchList!, ls = r.labelSheet!, ap = r.auditPacket!, le = r.labelEngine!, b = r.bundle!;
  const app = (x: unknown) => x as { reqPerSec: number; p99: number };
  rows.push(['Lot page throughput vs express.static', `${lp.throughputRatio} (${app(lp.app).reqPerSec} vs ${app(lp.baseline).reqPerSec} req/s)`, '>= 0.5']);
  rows.push(['Lot page p99 vs express.static', `${lp.p99Ratio} (${app(lp.app).p99} vs ${app(lp.baseline).p99} ms)`, '']);
  rows.push(['Lot page bytes', `${lp.bytes} B`, '<= 14 kB']);
  rows.push(['Batch list throughput vs bare Express + pg', `${bl.throughputRatio} (${app(bl.app).reqPerSec} vs ${app(bl.baseline).reqPerSec} req/s)`, '>= 0.4']);
  rows.push([`Batch list p99 at ${bl.offeredRate} req/s vs bare`, `${bl.p99RatioAtRate} (${app(bl.appAtRate).p99} vs ${app(bl.baselineAtRate).p99} ms)`, '<= 2']);
  rows.push(['Label sheet, 30 labels', `${ls.labels30Ms} ms, ${ls.labels30Bytes} B (${ls.timeRatio30To1}x one label)`, '<= 60 kB']);
  rows.push(['Audit packet, 1k / 100k events', `${ap.events1kMs} / ${ap.events100kMs} ms`, '']);
  rows.push(['Audit packet peak memory 100k / 1k', `${ap.peakMemoryRatio} (${ap.events1kPeakRssMb} / ${ap.events100kPeakRssMb} MB)`, '<= 1.5']);
  rows.push(['Audit packet CSV part vs COPY', `${ap.csvVsCopyRatio} (${ap.csvPartMs} vs ${ap.copyMs} ms)`, '<= 5']);
  rows.push(['Label engine 2,000 / 200 leaves', `${le.ratio} (${le.leaves2000Ms} / ${le.leaves200Ms} ms)`, '<= 15']);
  rows.push(['Bundle shell, gzip', `${b.shellGzipKb} kB`, '<= 150 kB']);
  rows.push(['Largest route chunk, gzip', `${b.largestRouteChunkGzipKb} kB`, '<= 50 kB']);
  rows.push(['CSS, gzip', `${b.cssGzipKb} kB`, '<= 20 kB']);
  const w = [0, 1, 2].map((i) => Math.max(...rows.map((x) => x[i]!.length), 6));
  console.log(['figure'.padEnd(w[0]!), 'measured'.padEnd(w[1]!), 'goal'].join(' | '));
  for (const row of rows) console.log(row.map((c, i) => c.padEnd(w[i]!)).join(' | '));
}

await main();
