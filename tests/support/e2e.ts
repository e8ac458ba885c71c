import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { promisify } from 'node:util';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { AxeBuilder } from '@axe-core/playwright';
import { eq } from 'drizzle-orm';
import { makeTestApp, type TestApp, type TestAppOptions } from './app';
import { DEMO_ACCOUNTS } from '../../server/db/seed/demo-accounts';
import { DEMO_STEPS } from '../../server/db/seed/steps';
import { seedDemo } from '../../server/db/seed/demo';
import { businesses } from '../../server/db/schema/business';

const ROOT = path.resolve(import.meta.dirname, '../..');
const run = promisify(execFile);

// Inputs of the client build; their content hash names the build folder.
const BUILD_INPUTS = ['src', 'shared', 'index.html', 'vite.config.ts', 'package.json'];

function hashInputs(): string {
  const hash = createHash('sha256');
  const walk = (p: string) => {
    const full = path.join(ROOT, p);
    if (!fs.existsSync(full)) return;
    const stat = fs.statSync(full);
    if (stat.isDirectory()) for (const name of fs.readdirSync(full).sort()) walk(path.join(p, name));
    else hash.update(p).update('\0').update(fs.readFileSync(full)).update('\0');
  };
  BUILD_INPUTS.forEach(walk);
  return hash.digest('hex').slice(0, 16);
}

let building: Promise<string> | undefined;

// Builds of older sources pile up in the temp folder; drop those not touched for a day.
function removeOldBuilds() {
  const dayAgo = Date.now() - 24 * 60 * 60 * 1000;
  for (const name of fs.readdirSync(os.tmpdir())) {
    if (!name.startsWith('crumbtrail-e2e-')) continue;
    const full = path.join(os.tmpdir(), name);
    try {
      if (fs.statSync(full).mtimeMs < dayAgo) fs.rmSync(full, { recursive: true, force: true });
    } catch {
      // Another run removed it first.
    }
  }
}

/**
 * Builds the client once per set of sources. Each process builds into its own fresh temp folder and
 * renames it into place; a rename that loses the race (folder already there) just uses the winner's.
 * Vite allows one build of a project at a time, so a process that meets another build waits and retries.
 * Nothing is ever written to dist/.
 */
export function buildClient(): Promise<string> {
  building ??= (async () => {
    const target = path.join(os.tmpdir(), `crumbtrail-e2e-build-${hashInputs()}`);
    // Vite refuses a second build of the same project at the same time: wait for the other one, then retry
    // (its result may already be in place).
    for (let attempt = 0; ; attempt++) {
      if (fs.existsSync(path.join(target, 'index.html'))) return target;
      try {
        await buildInto(target);
        return target;
      } catch (err) {
        if (attempt >= 90 || !/another Vite build process/i.test(`${(err as { stderr?: string }).stderr ?? ''} ${String(err)}`)) throw err;
        await new Promise((r) => setTimeout(r, 2_000));
      }
    }
  })();
  return building;
}

async function buildInto(target: string): Promise<void> {
  removeOldBuilds();
  const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'crumbtrail-e2e-tmp-'));
  try {
    await run(path.join(ROOT, 'node_modules/.bin/vite'), ['build', '--logLevel', 'warn'], {
      cwd: ROOT,
      env: { ...process.env, VITE_OUT_DIR: tmp },
      maxBuffer: 16 * 1024 * 1024,
    });
  } catch (err) {
    fs.rmSync(tmp, { recursive: true, force: true });
    throw err;
  }
  try {
    fs.renameSync(tmp, target);
  } catch {
    fs.rmSync(tmp, { recursive: true, force: true });
    if (!fs.existsSync(path.join(target, 'index.html'))) throw new Error(`client build folder ${target} is incomplete`);
  }
}

export interface E2eServerOptions extends TestAppOptions {
  /** Demo mode: the sign-in page lists the demo accounts (DEMO_ACCOUNTS unless config.demoAccounts is given). */
  demoMode?: boolean;
  /** Load the invented demo bakery into the run's database (once; later calls reuse it). Implies demoMode. */
  seedDemo?: boolean;
}

export interface E2eServer {
  baseUrl: string;
  t: TestApp;
  close: () => Promise<void>;
}

/** The built client and the real API on 127.0.0.1:<free port>, backed by the run's test database. */
export async function startE2eServer(options: E2eServerOptions = {}): Promise<E2eServer> {
  const staticDir = await buildClient();
  const demoMode = options.demoMode ?? options.seedDemo ?? false;
  const t = makeTestApp({
    ...options,
    config: {
      staticDir,
      demoMode,
      ...(demoMode ? { demoAccounts: DEMO_ACCOUNTS } : {}),
      ...options.config,
    },
  });
  if (options.seedDemo) await ensureDemoSeeded(t);
  const server = t.app.listen(0, '127.0.0.1');
  await new Promise<void>((resolve, reject) => server.once('listening', resolve).once('error', reject));
  const { port } = server.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    t,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

async function ensureDemoSeeded(t: TestApp): Promise<void> {
  try {
    await seedDemo(t.db, DEMO_STEPS, { publicBaseUrl: t.config.publicBaseUrl, uploadDir: t.config.uploadDir });
  } catch (err) {
    // Another test file may have loaded it at the same moment; that is fine if it is there now.
    const [demo] = await t.db.select({ id: businesses.id }).from(businesses).where(eq(businesses.isDemo, true)).limit(1);
    if (!demo) throw err;
  }
}

export const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

/** Debian's Chromium through playwright-core. Launch one per test file and close it in afterAll. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
}

export const VIEWPORTS = {
  phone: { width: 390, height: 844 },
  tablet: { width: 820, height: 1180 },
  desktop: { width: 1366, height: 900 },
} as const;

/** A fresh context (own cookies) and page; AxeBuilder needs a context page, not browser.newPage(). */
export async function newPage(browser: Browser, viewport: { width: number; height: number } = VIEWPORTS.desktop): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport, locale: 'en-US' });
  // Fail fast with a clear locator message rather than at vitest's 30 s test timeout.
  context.setDefaultTimeout(8_000);
  const page = await context.newPage();
  return { context, page };
}

/** Signs in through the real sign-in form and waits for the signed-in layout. */
export async function signInInBrowser(page: Page, baseUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password', { exact: true }).fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.getByRole('button', { name: 'Sign out' }).waitFor();
}

export const AXE_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'];

/** axe-core on the page as it is now; returns the violations (expect them to equal []). */
export async function checkA11y(page: Page) {
  const results = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
  return results.violations;
}

/** Violations in a form that reads well in a failing assertion. */
export function describeViolations(violations: Awaited<ReturnType<typeof checkA11y>>): string[] {
  return violations.map((v) => `${v.id}: ${v.help} → ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`);
}
