/**
 * Every page read as its user reads it, in chromium against the real server with the demo: no raw
 * float (more than six significant digits, or the program's exponent form), no code name
 * (camelCase, snake_case, kebab-case words of the API) and no "undefined", "NaN" or "null" in the
 * text, the hover titles or the labels; at most one laser-guide-star caution per page; and every
 * blank table cell says why (its title does). Code and sample CSV headers shown as code are the
 * one place where the API's names belong, so <code> and <pre> are left out of the scan.
 */
import type { Page } from 'playwright-core';
import { describe, expect, inject, test } from 'vitest';
import { MEASUREMENT_KIND_NAMES } from '../../descriptors/measurement-kinds.ts';
import { EVENT_KINDS } from '../../server/science/orbit/index.ts';
import { FLAG_KINDS } from '../../server/science/plan/index.ts';
import { chartPages } from './chart-page.ts';
import { apiCaller, nearPeriapsis } from './harness.ts';

const api = apiCaller(inject('baseUrl'), inject('leadToken'));
const open = chartPages();

/** Numbers with more significant digits than any measurement here supports (common practice, no source). */
const MAX_SIGNIFICANT = 6;
/** Trade notation that looks like code: v_r (radial velocity). */
const ALLOWED = new Set(['v_r', 'hPa', 'iCalendar']);

interface Seen {
  text: string;
  hover: string;
  lasers: number;
  blanks: string[];
}

/** The page's words once it has settled: main's text without code, its titles and labels, its blank cells. */
async function read(page: Page): Promise<Seen> {
  await page.locator('main h1, main h2').first().waitFor();
  await page.waitForLoadState('networkidle');
  await page.waitForFunction(() => !document.querySelector('main .loading'), null, {
    timeout: 90_000,
  });
  return page.evaluate(() => {
    const main = document.querySelector('main')!;
    // The words as drawn: every visible text node, those of one element run together and those of
    // neighbouring elements (buttons, cells) apart; code and sample headers left out.
    const parts: string[] = [];
    let last: Node | null = null;
    const walker = document.createTreeWalker(main, NodeFilter.SHOW_TEXT);
    for (let n = walker.nextNode(); n; n = walker.nextNode()) {
      const el = n.parentElement;
      if (!el || el.closest('code, pre, script, style, title, textarea')) continue;
      if (!(el instanceof SVGElement) && !el.checkVisibility()) continue;
      parts.push(el === last ? '' : ' ', n.textContent ?? '');
      last = el;
    }
    const text = parts.join('');
    const hover = [
      ...[...main.querySelectorAll('[title], [aria-label]')].flatMap((e) => [
        e.getAttribute('title') ?? '',
        e.getAttribute('aria-label') ?? '',
      ]),
      ...[...main.querySelectorAll('svg title')].map((t) => t.textContent ?? ''),
    ].join('\n');
    const lasers = [...main.querySelectorAll('.caution')].filter((c) =>
      /laser/i.test(c.textContent ?? ''),
    ).length;
    const blanks = [...main.querySelectorAll('td')]
      .filter(
        (td) =>
          /^[\s–—-]*$/.test(td.textContent ?? '') &&
          !td.querySelector('input, select, button, textarea, svg') &&
          !td.closest('[title]') &&
          !td.querySelector('[title]'),
      )
      .map((td) => {
        const table = td.closest('table');
        const head = table?.querySelectorAll('thead th')[(td as HTMLTableCellElement).cellIndex];
        const row = td.parentElement?.firstElementChild?.textContent ?? '';
        return `${table?.className || 'table'} · ${head?.textContent ?? '?'} · row “${row.trim()}”`;
      });
    return { text, hover, lasers, blanks };
  });
}

/** The API's hyphenated code words (kinds of events, flags, measurements, elements). */
const KEBAB = new RegExp(
  `(?<![\\w-])(?:${[...EVENT_KINDS, ...FLAG_KINDS, ...MEASUREMENT_KIND_NAMES, 'thiele-innes']
    .filter((k) => k.includes('-'))
    .join('|')})(?![\\w-])`,
  'g',
);

/** What a reader should never meet in `text`, each with the word that shows it. */
function problemsIn(text: string): string[] {
  const out: string[] = [];
  for (const m of text.matchAll(/(?<![\w.])(?:JD |MJD )?-?\d[\d,]*(?:\.\d+)?(?:e[+-]?\d+)?/g)) {
    const s = m[0];
    if (/^M?JD /.test(s)) continue; // a Julian Date to a hundredth of a day
    if (/e[+-]?\d/.test(s)) out.push(`exponent form ${s}`);
    const digits = s.replace(/^-/, '').replace(/[.,]/g, '').replace(/^0+/, '');
    if (digits.length > MAX_SIGNIFICANT && s.includes('.')) out.push(`raw float ${s}`);
  }
  for (const m of text.matchAll(/\b[a-z]+(?:[A-Z][a-z0-9]*)+\b/g))
    if (!ALLOWED.has(m[0])) out.push(`camelCase ${m[0]}`);
  for (const m of text.matchAll(/\b[a-z]+(?:_[a-z0-9]+)+\b/g))
    if (!ALLOWED.has(m[0])) out.push(`snake_case ${m[0]}`);
  for (const m of text.matchAll(KEBAB)) out.push(`code word ${m[0]}`);
  for (const m of text.matchAll(/\b(?:undefined|NaN|null|\[object Object\])\b/g))
    out.push(`stray ${m[0]}`);
  return out;
}

describe('every page in words', () => {
  test('the scan itself catches each kind of slip', () => {
    expect(
      problemsIn(
        'P 14.232511050150194 yr · M 2.00e+7 · gravitationalRedshift · same site_id · radial-velocity · σ undefined · NaN h',
      ),
    ).toEqual([
      'raw float 14.232511050150194',
      'exponent form 2.00e+7',
      'camelCase gravitationalRedshift',
      'snake_case site_id',
      'code word radial-velocity',
      'stray undefined',
      'stray NaN',
    ]);
    expect(problemsIn('JD 2461585.28 · 0.40 mas · v_r 12.5 km/s · 1.23 × 10⁵ M☉')).toEqual([]);
  });

  test('no raw float, code name or stray value; one laser caution; blank cells say why', async () => {
    const ids = async (p: string) =>
      (await api<{ items: { id: number }[] }>(`${p}?limit=500`)).items.map((x) => x.id);
    const nights = (await api<{ items: { id: number; date: string }[] }>('/nights?limit=500'))
      .items;
    const reports = (await api<{ items: { nightId: number }[] }>('/night-reports?limit=500')).items;
    const reported = new Set(reports.map((r) => r.nightId));
    const ahead = nights.filter((n) => !reported.has(n.id)).slice(-1);
    const found: string[] = [];
    const paths = [
      '/',
      '/nights',
      '/season',
      '/sites',
      '/time-request',
      '/records',
      ...(await ids('/targets')).map((id) => `/targets/${id}`),
      ...(await ids('/sites')).map((id) => `/sites/${id}`),
      ...[reports[0]!.nightId, ...ahead.map((n) => n.id)].flatMap((id) => [
        `/nights/${id}`,
        `/nights/${id}/report`,
      ]),
    ];
    for (const path of paths) {
      const { page, errors } = await open(path);
      if (path === '/time-request') {
        await page.locator('input[name="name"]').fill('W1');
        await page.locator('input[name="startDate"]').fill(nearPeriapsis(-60));
        await page.locator('input[name="endDate"]').fill(nearPeriapsis(60));
        await page.getByRole('button', { name: 'Write the request' }).click();
        await page
          .locator('.request-total, #time-request-form .error-line')
          .first()
          .waitFor({ timeout: 120_000 });
        const refused = page.locator('#time-request-form .error-line');
        if (await refused.count())
          found.push(`/time-request: refused: ${await refused.textContent()}`);
      }
      if (path === '/targets/3') {
        await page.getByRole('button', { name: 'Fit the stored measurements' }).click();
        await page.locator('table.fit-parameters tbody tr').first().waitFor({ timeout: 120_000 });
      }
      const seen = await read(page);
      for (const p of problemsIn(seen.text)) found.push(`${path}: ${p}`);
      for (const p of problemsIn(seen.hover)) found.push(`${path} (titles, labels): ${p}`);
      if (seen.lasers > 1) found.push(`${path}: ${seen.lasers} laser-guide-star cautions`);
      for (const b of seen.blanks) found.push(`${path}: blank cell without a reason: ${b}`);
      for (const e of errors) found.push(`${path}: console: ${e}`);
      await page.close();
    }
    console.log(`${paths.length} pages read`);
    expect([...new Set(found)]).toEqual([]);
  });
});
