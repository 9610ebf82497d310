/**
 * Client benchmarks, from the same harness as the browser tests (built client, real server with the
 * demo, Debian's chromium).
 *
 * client-bundle: gzipped size of the JavaScript a first visit loads (the entry chunk and every
 * chunk it preloads). Baseline: a Vite build, in the same process, of an entry that imports only
 * the libraries the client uses (preact, preact/hooks, luxon), so the ratio shows what our own
 * code adds. The budget is 100 kB.
 *
 * client-first-render: milliseconds from navigation start (the page's own performance clock) until
 * the campaign overview shows its flags, signed in, over the API. Baseline: the same page until
 * the sign-in form shows (no token: the shell alone, no API data). Median of 5 fresh contexts each.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { build } from 'vite';
import { CLIENT_DIST, REPO, buildClient, launchBrowser, startServer } from '../e2e/harness.ts';
import { benchLine, isMain } from './timing.ts';

const RUNS = 5;
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

/** Gzipped kB of the scripts an index.html loads at once (module entry plus modulepreload links). */
function initialScriptsKb(dist: string): number {
  const html = readFileSync(join(dist, 'index.html'), 'utf8');
  const srcs = [
    ...html.matchAll(/<script[^>]+src="([^"]+)"|<link[^>]+rel="modulepreload"[^>]+href="([^"]+)"/g),
  ].map((m) => m[1] ?? m[2]!);
  return srcs.reduce(
    (kb, src) => kb + gzipSync(readFileSync(join(dist, src.replace(/^\//, '')))).length / 1024,
    0,
  );
}

async function librariesOnlyKb(): Promise<number> {
  const dir = mkdtempSync(join(tmpdir(), 'epochwright-bench-'));
  try {
    writeFileSync(
      join(dir, 'index.html'),
      '<!doctype html><div id="app"></div><script type="module" src="./main.js"></script>',
    );
    writeFileSync(
      join(dir, 'main.js'),
      "import { h, render } from 'preact';\nimport { useState, useEffect } from 'preact/hooks';\nimport { DateTime } from 'luxon';\nrender(h('p', null, DateTime.now().toISO(), String(useState), String(useEffect)), document.getElementById('app'));\n",
    );
    await build({
      root: dir,
      configFile: false,
      logLevel: 'silent',
      resolve: {
        alias: {
          preact: join(REPO, 'node_modules/preact'),
          luxon: join(REPO, 'node_modules/luxon'),
        },
      },
      build: { outDir: join(dir, 'dist'), target: 'es2022' },
    });
    return initialScriptsKb(join(dir, 'dist'));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

export async function run(): Promise<string[]> {
  await buildClient();
  const appKb = initialScriptsKb(CLIENT_DIST);
  const libKb = await librariesOnlyKb();
  const lines = [
    benchLine(
      'client-bundle',
      appKb,
      'kB-gzip',
      appKb / libKb,
      `preact+luxon-only(${libKb.toFixed(1)}kB)`,
    ),
  ];
  const server = await startServer();
  const browser = await launchBrowser();
  try {
    const timeTo = async (path: string, selector: string) => {
      const ctx = await browser.newContext();
      const page = await ctx.newPage();
      await page.goto(`${server.url}${path}`);
      await page.locator(selector).first().waitFor();
      const ms = await page.evaluate(() => performance.now());
      await ctx.close();
      return ms;
    };
    const ours: number[] = [];
    const shell: number[] = [];
    for (let r = 0; r < RUNS; r++) {
      ours.push(await timeTo(`/?token=${server.token}`, '#flags .flag'));
      shell.push(await timeTo('/', 'form.sign-in'));
    }
    lines.push(
      benchLine(
        'client-first-render',
        median(ours),
        'ms',
        median(ours) / median(shell),
        'sign-in-shell-without-data',
      ),
    );
  } finally {
    await browser.close();
    await server.stop();
  }
  return lines;
}

if (isMain(import.meta.url)) for (const line of await run()) console.log(line);
