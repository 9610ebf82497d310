/**
 * Every record from the client, in chromium against the real server: a target, an orbit solution
 * with σ and a correlation (stored as the covariance C_ij = ρ σ_i σ_j, a constructed case), one
 * with a pasted covariance, a refused element named beside its field, an orbit CSV with σ
 * columns, and a block by hand on a night ahead.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { DEMO, SCREENSHOTS, apiCaller, launchBrowser, newContext } from './harness.ts';
import { thieleInnesJacobian, thieleInnesToCampbell } from '../../server/science/orbit/index.ts';

const base = inject('baseUrl');
const lead = inject('leadToken');
const api = apiCaller(base, lead);
let browser: Browser;

interface Solution {
  id: number;
  targetId: number;
  current: boolean;
  orbit: {
    elements: Record<string, unknown>;
    covariance?: { parameters: string[]; matrix: number[][] };
  };
}
interface Target {
  id: number;
  name: string;
  systemId: number;
}

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  browser = await launchBrowser();
});
afterAll(async () => browser?.close());

const solutionsOf = async (targetId: number) =>
  (await api<{ items: Solution[] }>(`/orbit-solutions?targetId=${targetId}&limit=500`)).items;

async function fillElements(page: Page, el: Record<string, string>) {
  const form = page.locator('form.solution-form');
  for (const [k, v] of Object.entries(el))
    await form.locator(`input[name="elements.${k}"]`).fill(v);
}

const ELEMENTS = {
  periodYears: '21.4',
  periapsis: '2031.25',
  eccentricity: '0.62',
  semiMajorAxisArcsec: '0.084',
  inclinationDeg: '71',
  ascendingNodeDeg: '140',
  argPeriapsisDeg: '310',
};

describe('every record from the client', () => {
  test('a target, then its orbit solutions with σ and correlations or a pasted covariance', async () => {
    const ctx = await newContext(browser, { viewport: { width: 1280, height: 1000 } });
    const page = await ctx.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await page.goto(`${base}/records?token=${lead}`);
    const targetForm = page.locator('form[aria-label="New target"]');
    await targetForm.waitFor();
    await targetForm.locator('input[name=name]').fill('Wren');
    await targetForm.locator('input[name=magnitude]').fill('15.2');
    await targetForm.locator('input[name=band]').fill('K');
    await targetForm.getByRole('button', { name: 'Add' }).click();
    await targetForm.getByText(/Wren added/).waitFor();
    const wren = (await api<{ items: Target[] }>('/targets?limit=500')).items.find(
      (t) => t.name === 'Wren',
    )!;
    expect(wren).toBeTruthy();

    // A refused element is named beside its field, and nothing is stored.
    const form = page.locator('form.solution-form');
    await form.locator('select[name=targetId]').selectOption(String(wren.id));
    await fillElements(page, { ...ELEMENTS, eccentricity: '1.2' });
    await form.getByRole('button', { name: 'Store solution' }).click();
    await form.locator('tr.invalid .field-msg').waitFor();
    await expect(form.locator('tr.invalid input').first().getAttribute('name')).resolves.toBe(
      'elements.eccentricity',
    );
    expect(await solutionsOf(wren.id)).toEqual([]);

    // Elements with σ and one correlation.
    await fillElements(page, ELEMENTS);
    await form.locator('input[name=sigma-periodYears]').fill('0.3');
    await form.locator('input[name=sigma-periapsisDays]').fill('12');
    await form.locator('input[name=sigma-eccentricity]').fill('0.01');
    await form.locator('input[name=rho-periapsisDays-eccentricity]').fill('0.4');
    await form.getByRole('button', { name: 'Store solution' }).click();
    await form.getByText(/Stored as solution #\d+, now current/).waitFor();
    const [first] = await solutionsOf(wren.id);
    expect(first!.current).toBe(true);
    // C_ij = ρ σ_i σ_j (constructed case): 0.4 × 12 d × 0.01.
    expect(first!.orbit.covariance!.parameters).toEqual([
      'periodYears',
      'periapsisDays',
      'eccentricity',
    ]);
    const m = first!.orbit.covariance!.matrix;
    expect(m[0]![0]).toBeCloseTo(0.09, 12);
    expect(m[1]![1]).toBeCloseTo(144, 9);
    expect(m[1]![2]).toBeCloseTo(0.4 * 12 * 0.01, 12);
    expect(m[0]![2]).toBe(0);

    // A pasted covariance instead.
    await form.locator('input[name=uncertainty]').nth(1).check();
    await form.locator('textarea[name=covariance]').fill('P e\n0.04 0.0001\n0.0001 0.0004'); // the elements' symbols name the rows
    await form.getByRole('button', { name: 'Store solution' }).click();
    await expect.poll(async () => (await solutionsOf(wren.id)).length).toBe(2);
    const pasted = (await solutionsOf(wren.id)).find((s) => s.id !== first!.id)!;
    expect(pasted.orbit.covariance).toEqual({
      parameters: ['periodYears', 'eccentricity'],
      matrix: [
        [0.04, 0.0001],
        [0.0001, 0.0004],
      ],
    });
    // The solutions table shows each element rounded to its σ, without code names.
    await page.locator('#orbit-solutions').getByText('21.40 ± 0.20').first().waitFor();
    await expect(page.locator('#orbit-solutions').textContent()).resolves.not.toMatch(
      /gravitationalRedshift|\d\.\d{8}/,
    );
    await page.screenshot({ path: join(SCREENSHOTS, 'records-forms.png'), fullPage: true });
    expect(errors).toEqual([]);
    await ctx.close();
  });

  test('a Thiele–Innes solution and one with relativity settings, checked through the API', async () => {
    const ctx = await newContext(browser, { viewport: { width: 1280, height: 1100 } });
    const page = await ctx.newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    const t = (await api<{ items: Target[] }>('/targets?limit=500')).items[0]!;
    const before = (await solutionsOf(t.id)).length;
    await page.goto(`${base}/records?token=${lead}`);
    const form = page.locator('form.solution-form');
    await form.waitFor();
    await form.locator('select[name=targetId]').selectOption(String(t.id));

    // Thiele–Innes constants (constructed case) with σ of P and T and their correlation.
    await form.getByLabel('Thiele–Innes constants').check();
    await expect(form.locator('input[name="elements.inclinationDeg"]').count()).resolves.toBe(0);
    const ti = { aArcsec: '0.041', bArcsec: '-0.018', fArcsec: '0.027', gArcsec: '0.035' };
    // A time without its zone is refused beside T, in words (never read in the machine's zone).
    await fillElements(page, {
      periodYears: '11.5',
      periapsis: '2030-02-01T00:00',
      eccentricity: '0.55',
      ...ti,
    });
    await form.getByRole('button', { name: 'Store solution' }).click();
    const tMsg = form.locator('tr.invalid .field-msg');
    await tMsg.waitFor();
    expect(await tMsg.textContent()).toMatch(/time zone/);
    expect((await solutionsOf(t.id)).length).toBe(before);
    await fillElements(page, { periapsis: '2030-02-01T00:00-03' });
    await form.locator('input[name=sigma-periodYears]').fill('0.2');
    await form.locator('input[name=sigma-periapsisDays]').fill('6');
    await form.locator('input[name=rho-periodYears-periapsisDays]').fill('-0.3');
    // σ of A and B as a published Thiele–Innes orbit gives them (constructed case), correlated.
    await form.locator('input[name=sigma-aArcsec]').fill('0.002');
    await form.locator('input[name=sigma-bArcsec]').fill('0.003');
    await form.locator('input[name=rho-aArcsec-bArcsec]').fill('0.25');
    await form.locator('.thiele-innes-note').getByText('first-order propagation').waitFor();
    await form.locator('input[name=makeCurrent]').uncheck();
    await form.getByRole('button', { name: 'Store solution' }).click();
    await form.getByText(/Stored as solution #\d+\./).waitFor();
    const stored = (await solutionsOf(t.id)).slice(before);
    expect(stored).toHaveLength(1);
    expect(stored[0]!.current).toBe(false);
    expect(stored[0]!.orbit.elements).toEqual({
      kind: 'thiele-innes',
      periodYears: 11.5,
      periapsis: '2030-02-01T00:00-03', // kept as typed; ISO 8601 with an offset
      eccentricity: 0.55,
      aArcsec: 0.041,
      bArcsec: -0.018,
      fArcsec: 0.027,
      gArcsec: 0.035,
    });
    // C_ij = ρ σ_i σ_j (constructed case): −0.3 × 0.2 yr × 6 d; A and B carried to a, i, Ω, ω
    // through the conversion's Jacobian (its own checks: test/science/orbit/thiele-innes-covariance).
    const cov = stored[0]!.orbit.covariance!;
    expect(cov.parameters).toEqual([
      'periodYears',
      'periapsisDays',
      'semiMajorAxisArcsec',
      'inclinationDeg',
      'ascendingNodeDeg',
      'argPeriapsisDeg',
    ]);
    expect(cov.matrix[0]![1]).toBeCloseTo(-0.3 * 0.2 * 6, 12);
    const constants = { A: 0.041, B: -0.018, F: 0.027, G: 0.035 };
    const J = thieleInnesJacobian({
      ti: constants,
      campbell: thieleInnesToCampbell(constants),
    });
    const sAB = [
      [0.002 ** 2, 0.25 * 0.002 * 0.003],
      [0.25 * 0.002 * 0.003, 0.003 ** 2],
    ];
    for (let r = 0; r < 4; r++)
      for (let c = 0; c < 4; c++) {
        const expected = [0, 1].reduce(
          (sum, x) => sum + [0, 1].reduce((t, y) => t + J[r]![x]! * sAB[x]![y]! * J[c]![y]!, 0),
          0,
        );
        expect(cov.matrix[2 + r]![2 + c]).toBeCloseTo(expected, 12);
      }
    expect(cov.matrix[0]![2]).toBe(0); // P and A were uncorrelated, so P and a are

    // Campbell elements with two relativistic terms and their factors; a bad factor first.
    await form.getByLabel('Campbell elements').check();
    await fillElements(page, ELEMENTS);
    await form.locator('input[name="distancePc"]').fill('9200');
    await form.getByLabel('gravitational redshift').check();
    await form.getByLabel('Schwarzschild precession').check();
    await form.locator('input[name=factor-redshiftFactor]').fill('250');
    await form.getByRole('button', { name: 'Store solution' }).click();
    const factorMsg = form.locator('.relativity-input .field-msg').first();
    await factorMsg.waitFor();
    expect(await factorMsg.textContent()).not.toMatch(/relativityFactors|redshiftFactor/);
    expect((await solutionsOf(t.id)).length).toBe(before + 1);
    await form.locator('input[name=factor-redshiftFactor]').fill('0.9');
    await form.locator('input[name=factor-precessionFactor]').fill('1.1');
    await form.getByRole('button', { name: 'Store solution' }).click();
    await expect.poll(async () => (await solutionsOf(t.id)).length).toBe(before + 2);
    const rel = (await solutionsOf(t.id)).slice(before + 1)[0]!.orbit as Solution['orbit'] & {
      relativity?: Record<string, boolean>;
      relativityFactors?: Record<string, number>;
      distancePc?: number;
    };
    expect(rel.relativity).toEqual({ gravitationalRedshift: true, precession: true });
    expect(rel.relativityFactors).toEqual({ redshiftFactor: 0.9, precessionFactor: 1.1 });
    expect(rel.distancePc).toBe(9200);
    await page
      .locator('#orbit-solutions')
      .getByText(/gravitational redshift, Schwarzschild precession/)
      .first()
      .waitFor();
    await form.screenshot({ path: join(SCREENSHOTS, 'solution-form-relativity.png') });
    expect(errors.filter((e) => !/422|400/.test(e))).toEqual([]);
    await ctx.close();
  });

  test('an orbit CSV with σ columns through the import form', async () => {
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    const targets = (await api<{ items: Target[] }>('/targets?limit=500')).items;
    const systems = (await api<{ items: { id: number; name: string }[] }>('/systems?limit=500'))
      .items;
    const t = targets.find((x) => x.name === 'Wren') ?? targets[0]!;
    const system = systems.find((s) => s.id === t.systemId)!;
    await page.goto(`${base}/records?token=${lead}`);
    const imp = page.locator('.csv-import');
    await imp.waitFor();
    await imp.locator('select').selectOption('orbits');
    await imp
      .locator('textarea')
      .fill(
        `system,target,periodYears,periapsis,eccentricity,semiMajorAxisArcsec,inclinationDeg,ascendingNodeDeg,argPeriapsisDeg,sigmaPeriodYears,sigmaEccentricity,correlations\n${system.name},${t.name},21.5,2031.3,0.61,0.085,71,140,310,0.2,0.02,periodYears/eccentricity=-0.25\n`,
      );
    await imp.getByRole('button', { name: 'Import all rows' }).click();
    await imp.getByText(/^1 row imported/).waitFor();
    const latest = (await solutionsOf(t.id)).find((s) => s.current)!;
    expect(latest.orbit.covariance!.matrix[0]![1]).toBeCloseTo(-0.25 * 0.2 * 0.02, 12);
    await ctx.close();
  });

  test('a block by hand on a night ahead', async () => {
    const nights = (
      await api<{ items: { id: number; date: string; campaignId: number | null }[] }>(
        `/nights?start=${DEMO.day(30)}&limit=500`,
      )
    ).items.filter((n) => n.campaignId !== null);
    const night = nights.sort((a, b) => a.date.localeCompare(b.date))[0]!;
    const vis = await api<{
      darkness: { intervals: { start: { utc: string } }[] };
      site: { timeZone: string };
    }>(`/nights/${night.id}/visibility`);
    const before = (await api<{ items: unknown[] }>(`/blocks?nightId=${night.id}`)).items.length;
    const ctx = await newContext(browser);
    const page = await ctx.newPage();
    await page.goto(`${base}/nights/${night.id}?token=${lead}`);
    await page.getByRole('heading', { name: 'Add a block by hand' }).waitFor();
    const form = page.locator('form.block-log-form');
    // Ten minutes of darkness at its start, typed in UTC.
    const start = new Date(Date.parse(vis.darkness.intervals[0]!.start.utc) + 5 * 60_000);
    const hhmm = (d: Date) => d.toISOString().slice(11, 16);
    await form.locator('select[name=clock]').selectOption('utc');
    await form.locator('input[name=start]').fill(hhmm(start));
    await form.locator('input[name=end]').fill(hhmm(new Date(start.getTime() + 10 * 60_000)));
    await expect(form.locator('select[name=status] option').allTextContents()).resolves.toEqual([
      'planned',
      'withdrawn',
    ]);
    await form.getByRole('button', { name: 'Add this block' }).click();
    await form.getByText(/Added: .* planned\./).waitFor();
    const blocks = (
      await api<{ items: { origin: string; startUtc: string }[] }>(`/blocks?nightId=${night.id}`)
    ).items;
    expect(blocks.length).toBe(before + 1);
    expect(
      blocks.some((b) => b.origin === 'by-hand' && b.startUtc.slice(11, 16) === hhmm(start)),
    ).toBe(true);
    await ctx.close();
  });
});
