/**
 * What the browser tests and the client benchmark share: build the client with Vite, start the
 * real server (server/main.ts, as `npm start` does) on port 0 with a temporary database and the
 * demo campaign, and launch Debian's chromium through playwright-core.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import {
  chromium,
  type Browser,
  type BrowserContext,
  type BrowserContextOptions,
} from 'playwright-core';
import { DEMO_DAYS, HEADLINE, demoAnchor } from '../../server/store/demo/scenario.ts';
import { build } from 'vite';

export const REPO = resolve(import.meta.dirname, '../..');
export const CLIENT_DIST = join(REPO, 'client/dist');
export const SCREENSHOTS = join(REPO, 'test-output/e2e');
export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
/**
 * The instant the browser tests run at: the server's clock is frozen there (EPOCHWRIGHT_NOW) and each
 * browser context's clock starts there, so the demo campaign, built around the clock, looks the same
 * on any day the suite runs. The same instant as the unit suite's (vitest.config.ts). Tests read the
 * demo's dates from its calendar (DEMO, nearPeriapsis), never as literals.
 */
export const TEST_NOW = '2026-12-01T12:00:00Z';
export const DEMO = demoAnchor(TEST_NOW);
/** The demo day `n` days from its headline star's periapsis. */
export const nearPeriapsis = (n: number) => DEMO.day(DEMO_DAYS.periapsis + n);
export { HEADLINE };

/** Build client/dist exactly as `npm run build` does. */
export async function buildClient(): Promise<void> {
  await build({ configFile: join(REPO, 'client/vite.config.ts'), logLevel: 'warn' });
}

export interface RunningServer {
  url: string;
  token: string;
  /** The server's database, for tests that store a row as an older version would have. */
  databaseUrl: string;
  stop(): Promise<void>;
}

/** Start server/main.ts on a free port with a fresh database; resolves once it prints its address and first token. */
export async function startServer(): Promise<RunningServer> {
  const dir = mkdtempSync(join(tmpdir(), 'epochwright-e2e-'));
  const tsx = join(REPO, 'node_modules/tsx/dist/cli.mjs');
  const databaseUrl = `file:${join(dir, 'e2e.db')}`;
  const child: ChildProcess = spawn(process.execPath, [tsx, 'server/main.ts'], {
    cwd: REPO,
    env: {
      ...process.env,
      PORT: '0',
      HOST: '127.0.0.1',
      DATABASE_URL: databaseUrl,
      EPOCHWRIGHT_DEMO: '1',
      EPOCHWRIGHT_NOW: TEST_NOW,
      EPOCHWRIGHT_CHECK_RESPONSES: '1',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  const ready = new Promise<{ url: string; token: string }>((ok, fail) => {
    const timer = setTimeout(
      () => fail(new Error(`server did not start in 90 s:\n${out}`)),
      90_000,
    );
    const look = (chunk: Buffer) => {
      out += chunk.toString();
      const url = /listening on (http:\/\/\S+?)\/? /.exec(out)?.[1];
      const token = /^\s*token: (\S+)$/m.exec(out)?.[1];
      if (url && token) {
        clearTimeout(timer);
        ok({ url, token });
      }
    };
    child.stdout!.on('data', look);
    child.stderr!.on('data', look);
    child.on('exit', (code) => {
      clearTimeout(timer);
      fail(new Error(`server exited with ${code}:\n${out}`));
    });
  });
  const { url, token } = await ready;
  return {
    url,
    token,
    databaseUrl,
    async stop() {
      if (child.exitCode === null) {
        const exited = new Promise((r) => child.once('exit', r));
        child.kill('SIGTERM');
        await exited;
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Headless chromium with the quiet flags from DEVELOPERS.md. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--no-first-run',
    ],
  });
}

/** A fetch wrapper for the API, signed in with a bearer token (`defaultToken` unless one is given). */
export function apiCaller(base: string, defaultToken: string) {
  return async function api<T>(
    path: string,
    init: { method?: string; body?: unknown; token?: string } = {},
  ): Promise<T> {
    const res = await fetch(`${base}/api${path}`, {
      method: init.method ?? 'GET',
      headers: {
        authorization: `Bearer ${init.token ?? defaultToken}`,
        ...(init.body ? { 'content-type': 'application/json' } : {}),
      },
      ...(init.body ? { body: JSON.stringify(init.body) } : {}),
    });
    if (!res.ok)
      throw new Error(`${init.method ?? 'GET'} ${path}: ${res.status} ${await res.text()}`);
    return (res.status === 204 ? undefined : await res.json()) as T;
  };
}

/** A browser context whose clock starts at TEST_NOW and then runs on. */
export async function newContext(
  browser: Browser,
  options: BrowserContextOptions = {},
): Promise<BrowserContext> {
  const ctx = await browser.newContext(options);
  await ctx.clock.install({ time: TEST_NOW });
  return ctx;
}
