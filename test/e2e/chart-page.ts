/** One browser and one context for a file of chart tests, and signed-in pages that record console errors. */
import { mkdirSync } from 'node:fs';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, inject } from 'vitest';
import { SCREENSHOTS, launchBrowser, newContext } from './harness.ts';

/** Registers the file's beforeAll/afterAll; `open(path)` signs in as the first lead. */
export function chartPages(viewport = { width: 1280, height: 1000 }) {
  let browser: Browser | undefined;
  let ctx: BrowserContext | undefined;
  beforeAll(async () => {
    mkdirSync(SCREENSHOTS, { recursive: true });
    browser = await launchBrowser();
    ctx = await newContext(browser, { viewport });
  });
  afterAll(async () => {
    await ctx?.close();
    await browser?.close();
  });
  return async function open(path: string): Promise<{ page: Page; errors: string[] }> {
    const page = await ctx!.newPage();
    const errors: string[] = [];
    page.on('console', (m) => m.type() === 'error' && errors.push(m.text()));
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(`${inject('baseUrl')}${path}?token=${inject('leadToken')}`);
    return { page, errors };
  };
}
