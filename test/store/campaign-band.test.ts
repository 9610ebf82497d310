/**
 * Refraction in a campaign's band: a campaign that sets `goals.wavelengthUm` sees every site's sky
 * at that wavelength (the site's own otherwise), down to the altitudes of its targets.
 *
 * Demo scenario (server/store/demo/scenario.ts, invented).
 */
import { afterAll, beforeAll, expect, it } from 'vitest';
import { refractionDeg, siteRefraction, validateSite } from '../../server/science/sky/index.ts';
import { LOCAL_OPERATOR, createStore, openDatabase, type Store } from '../../server/store/index.ts';

let store: Store;
beforeAll(async () => {
  store = createStore(await openDatabase({ url: ':memory:' }));
  await store.loadDemo(LOCAL_OPERATOR, {});
});
afterAll(() => store.close());

it('a campaign observing at 0.55 µm refracts as ERFA’s formulas say there, not at the site’s 2.2 µm', async () => {
  const nights = (await store.nights.list({}, { limit: 200 })).items.filter(
    (n) => n.campaignId !== null,
  );
  const night = nights[0]!;
  const before = await store.nightVisibility(night.id);
  expect(before.site.wavelengthUm).toBe(2.2); // the site's default (DEFAULT_WAVELENGTH_UM)
  expect(before.site.wavelengthFrom).toBe('default');
  expect(before.site.refraction).toMatch(
    /^refraction at 2\.2 µm \(K band; no band set, the default\)/,
  );
  const campaign = await store.campaigns.get(night.campaignId!);
  await store.campaigns.update(LOCAL_OPERATOR, campaign.id, {
    goals: { ...campaign.goals, wavelengthUm: 0.55 },
  });
  const after = await store.nightVisibility(night.id);
  expect(after.site.wavelengthUm).toBe(0.55);
  expect(after.site.wavelengthFrom).toBe('campaign');
  expect(after.site.refraction).toMatch(/^refraction at 0\.55 µm \(V band; the campaign's band\)/);
  // The refraction at 20° grows from 2.2 to 0.55 µm by the dispersion of air: ERFA refco's A is
  // 56.990″ at 2.2 µm and 58.020″ at 0.55 µm (1010 hPa, 10 °C, RH 0.5; docs/REFERENCES.md), 1.8 %.
  const siteRow = await store.sites.get(night.siteId);
  const r = (wl: number) =>
    refractionDeg(20, siteRefraction(validateSite({ ...siteRow, wavelengthUm: wl })));
  const gain = r(0.55) / r(2.2) - 1;
  expect(gain).toBeGreaterThan(0.015);
  expect(gain).toBeLessThan(0.025);
});

it('says which wavelength it used: the campaign’s over the site’s, the site’s over the default', async () => {
  const night = (await store.nights.list({}, { limit: 200 })).items.find(
    (n) => n.campaignId !== null,
  )!;
  const campaign = await store.campaigns.get(night.campaignId!);
  const { wavelengthUm: _w, ...goals } = campaign.goals;
  await store.campaigns.update(LOCAL_OPERATOR, campaign.id, { goals });
  const site = await store.sites.get(night.siteId);
  await store.sites.update(LOCAL_OPERATOR, site.id, { wavelengthUm: 1.25 });
  const seen = await store.nightVisibility(night.id);
  expect([seen.site.wavelengthUm, seen.site.wavelengthFrom]).toEqual([1.25, 'site']);
  expect(seen.site.refraction).toMatch(/^refraction at 1\.25 µm \(J band; the site's setting\)/);
  await store.campaigns.update(LOCAL_OPERATOR, campaign.id, {
    goals: { ...goals, wavelengthUm: 1.65 },
  });
  const over = await store.nightVisibility(night.id);
  expect([over.site.wavelengthUm, over.site.wavelengthFrom]).toEqual([1.65, 'campaign']);
  // A wavelength outside the formulas' range is refused naming the field, the value and the rule; nothing is written.
  const before = await store.campaigns.get(campaign.id);
  await expect(
    store.campaigns.update(LOCAL_OPERATOR, campaign.id, { goals: { ...goals, wavelengthUm: 0.1 } }),
  ).rejects.toThrow(/goals\.wavelengthUm.*0\.1.*0\.3/s);
  expect(await store.campaigns.get(campaign.id)).toEqual(before);
});
