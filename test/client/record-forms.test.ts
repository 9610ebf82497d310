/**
 * The create forms' request building: dotted field keys become nested bodies, empty optional
 * fields are left to the server's defaults, and the server's field paths (400 issues, 422 details)
 * are shown beside the form field that holds them. The expected bodies follow the store's schemas
 * (server/store/schemas/entities.ts), checked here against the schemas themselves.
 */
import { describe, expect, test } from 'vitest';
import { ApiError, fieldMessages } from '../../client/src/api/client.ts';
import { bodyOf, messagesByField, parseMask } from '../../client/src/views/record-forms.tsx';
import { formFields } from '../../client/src/views/record-fields.ts';
import { CampaignInput, SiteFields, SystemFields } from '../../server/store/schemas/entities.ts';

// No stored records to choose among: the bodies below name their ids themselves.
const stored = { systems: [], targets: [], sites: [] };
const SYSTEM_FIELDS = formFields('systems', stored);
const SITE_FIELDS = formFields('sites', stored);
const CAMPAIGN_FIELDS = formFields('campaigns', stored);

describe('request bodies', () => {
  test('a campaign: nested goals and limits, empty optional fields left out, the schema accepts it', () => {
    const r = bodyOf(CAMPAIGN_FIELDS, {
      name: 'Dusk run',
      startDate: '2028-03-01',
      endDate: '2028-09-30',
      'goals.cadenceDays': '14',
      'goals.kinds': 'both',
      'goals.densifiedCadenceDays': '',
      'goals.densifyWithinDays': '',
      'limits.highestAirmass': '1.8',
      'limits.leastMoonDistanceDeg': '',
      'limits.darkness': '',
      targetIds: [2, 3],
      siteIds: [1],
      notes: '',
    });
    expect(r).toEqual({
      body: {
        name: 'Dusk run',
        startDate: '2028-03-01',
        endDate: '2028-09-30',
        goals: { cadenceDays: 14, kinds: ['astrometry', 'spectroscopy'] },
        limits: { highestAirmass: 1.8 },
        targetIds: [2, 3],
        siteIds: [1],
      },
    });
    expect(CampaignInput.safeParse((r as { body: unknown }).body).success).toBe(true);
  });

  test('a site with a horizon mask typed as pairs; the schema accepts it', () => {
    const r = bodyOf(SITE_FIELDS, {
      name: 'Harrow Knoll',
      latitudeDeg: '-29.25',
      longitudeDeg: '-70.7',
      elevationM: '2350',
      timeZone: 'America/Santiago',
      lowestAltitudeDeg: '',
      leastSunDistanceDeg: '',
      pressureHpa: '',
      temperatureC: '',
      horizonMask: '0 8, 170 34; 260 7',
      laserGuideStar: false,
      notes: '',
    });
    expect(r).toEqual({
      body: {
        name: 'Harrow Knoll',
        latitudeDeg: -29.25,
        longitudeDeg: -70.7,
        elevationM: 2350,
        timeZone: 'America/Santiago',
        horizonMask: [
          { azimuthDeg: 0, altitudeDeg: 8 },
          { azimuthDeg: 170, altitudeDeg: 34 },
          { azimuthDeg: 260, altitudeDeg: 7 },
        ],
        laserGuideStar: false,
      },
    });
    expect(SiteFields.safeParse((r as { body: unknown }).body).success).toBe(true);
  });

  test('a system with its position epoch; the schema accepts it', () => {
    const r = bodyOf(SYSTEM_FIELDS, {
      name: 'Quill Pair',
      raDeg: '12.5',
      decDeg: '-40.25',
      positionEpoch: 'J2016.0',
      pmRaMasYr: '88',
      pmDecMasYr: '',
      distancePc: '31',
      massSolar: '',
      notes: '',
    });
    expect(r).toEqual({
      body: {
        name: 'Quill Pair',
        raDeg: 12.5,
        decDeg: -40.25,
        positionEpoch: 'J2016.0',
        pmRaMasYr: 88,
        distancePc: 31,
      },
    });
    expect(SystemFields.safeParse((r as { body: unknown }).body).success).toBe(true);
  });

  test('a required number left empty, and a mask pair that is not two numbers, are named before anything is sent', () => {
    expect(bodyOf(SYSTEM_FIELDS, { name: 'x', raDeg: '', decDeg: '1' })).toEqual({
      field: 'raDeg',
      rule: '"" must be a number',
    });
    expect(parseMask('0 8, 170')).toEqual({
      rule: 'pair 2 "170" must be two numbers: azimuth then altitude, degrees',
    });
  });
});

describe('server messages beside their fields', () => {
  test('400 issues on nested paths and a 422 on a mask point land on the form field holding them', () => {
    const bad400 = new ApiError(400, 'invalid_request', 'goals.cadenceDays: too small', {
      issues: [
        { field: 'goals.cadenceDays', rule: 'must be above 0' },
        { field: 'endDate', rule: 'must not be before startDate' },
      ],
    });
    expect(messagesByField(CAMPAIGN_FIELDS, fieldMessages(bad400))).toEqual({
      'goals.cadenceDays': 'must be above 0',
      // The request's field names read as the form's labels (client/src/lib/field-words.ts).
      endDate: 'must not be before first night',
    });
    const bad422 = new ApiError(422, 'invalid_value', 'horizonMask.1.altitudeDeg', {
      field: 'horizonMask.1.altitudeDeg',
      value: 95,
      rule: 'must lie in [-5, 90)',
    });
    expect(messagesByField(SITE_FIELDS, fieldMessages(bad422))).toEqual({
      horizonMask: 'horizon mask point 2, altitude: 95 must lie in [-5, 90)',
    });
  });

  test('a path no field holds is kept for the form as a whole', () => {
    expect(messagesByField(SYSTEM_FIELDS, { '(body)': 'must be an object' })).toEqual({
      '(form)': 'must be an object',
    });
  });
});
