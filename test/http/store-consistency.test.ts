/**
 * The consistency rules between stored rows (server/store/repos/block-rules.ts and
 * measurement-rules.ts), each refused with its status, field, value and rule, and nothing written
 * (table counts compared before and after). All cases are constructed: the fixture's site sits at
 * 24.9° S, so its June nights at 04:00–06:00 UTC are deep in astronomical darkness and its local
 * noon (16:00 UTC) is daylight; the tests' clock is 2026-12-01T12:00Z (vitest.config.ts).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS, fixture, tableCounts, type Fixture } from '../store/backends.ts';

interface ErrorBody {
  error: {
    code: string;
    message: string;
    details: {
      field: string;
      value: unknown;
      rule: string;
      dependents?: { entity: string; id: number }[];
      problems?: { line: number; column: string; rule: string }[];
    };
  };
}

const OFFSETS = {
  kind: 'offsets',
  dRaMas: 1,
  dDecMas: 2,
  sigmaDRaMas: 0.3,
  sigmaDDecMas: 0.3,
  instrument: 'rule imager',
};

describe.each(BACKENDS)('consistency rules on $name', (backend) => {
  let f: Fixture;
  let cleanup: () => void;
  let otherTarget: number;
  beforeAll(async () => {
    const opened = await backend.open();
    cleanup = opened.cleanup;
    f = await fixture(opened.store);
    otherTarget = (
      (await (
        await f.call('lead', 'POST', '/api/targets', { systemId: f.ids.system, name: 'Wren b' })
      ).json()) as { id: number }
    ).id;
  });
  afterAll(() => cleanup());

  /** Send a write that must be refused: its status, code and field, and no table changed. */
  async function refused(
    method: string,
    path: string,
    body: unknown,
    status: number,
    code: string,
    field: string,
  ): Promise<ErrorBody['error']> {
    const before = await tableCounts(f.store);
    const res = await f.call('lead', method, path, body);
    const json = (await res.json()) as ErrorBody;
    expect(res.status, JSON.stringify(json)).toBe(status);
    expect(json.error.code).toBe(code);
    expect(json.error.details.field).toBe(field);
    expect(json.error.details.rule.length).toBeGreaterThan(10);
    expect(await tableCounts(f.store)).toEqual(before);
    return json.error;
  }
  const created = async (path: string, body: unknown) => {
    const res = await f.call('lead', 'POST', path, body);
    const text = await res.text();
    expect(res.status, text).toBe(201);
    return JSON.parse(text) as { id: number; version: number; status: string };
  };
  const block = (extra: Record<string, unknown>) => ({
    nightId: f.ids.night,
    targetId: f.ids.target,
    kind: 'astrometry',
    ...extra,
  });

  it('refuses a measurement of another kind than its block, or outside its block’s night', async () => {
    // constructed case: the fixture's block is astrometry on night 2026-06-10
    const kind = await refused(
      'POST',
      '/api/measurements',
      {
        targetId: f.ids.target,
        blockId: f.ids.block,
        kind: 'radial-velocity',
        epoch: '2026-06-11T04:30:00Z',
        radialVelocityKmS: 10,
        sigmaRadialVelocityKmS: 1,
        instrument: 'rule spectrograph',
      },
      422,
      'invalid_value',
      'kind',
    );
    expect(kind.details.rule).toContain('spectroscopy');
    // a day after the block: outside the night (local noon 2026-06-10 to local noon 2026-06-11)
    const late = await refused(
      'POST',
      '/api/measurements',
      { targetId: f.ids.target, blockId: f.ids.block, epoch: '2026-06-12T04:30:00Z', ...OFFSETS },
      422,
      'invalid_value',
      'epoch',
    );
    expect(late.details.rule).toContain('night 2026-06-10');
    await created('/api/measurements', {
      targetId: f.ids.target,
      blockId: f.ids.block,
      epoch: '2026-06-11T04:30:00Z',
      ...OFFSETS,
    });
  });

  it('refuses a measurement from after the clock, and a report of a night that is not over', async () => {
    await refused(
      'POST',
      '/api/measurements',
      { targetId: f.ids.target, epoch: '2026-12-05T04:00:00Z', ...OFFSETS },
      422,
      'invalid_value',
      'epoch',
    );
    // A site near 155.5° W: at the clock (12:00 UTC = 02:00 local) the night of 2026-11-30 is still on.
    const site = await created('/api/sites', {
      name: 'Rule Summit',
      latitudeDeg: 19.8,
      longitudeDeg: -155.5,
      elevationM: 4100,
      timeZone: 'Pacific/Honolulu',
    });
    const night = await created('/api/nights', { siteId: site.id, date: '2026-11-30' });
    const tonight = await created('/api/blocks', {
      ...block({ nightId: night.id }),
      startUtc: '2026-12-01T08:00:00Z',
      endUtc: '2026-12-01T09:00:00Z',
    });
    const report = await refused(
      'POST',
      '/api/night-reports',
      { nightId: night.id },
      422,
      'invalid_value',
      'nightId',
    );
    expect(report.details.rule).toContain('not over until sunrise');
    await refused(
      'POST',
      '/api/measurements',
      { targetId: f.ids.target, blockId: tonight.id, epoch: '2026-12-01T08:30:00Z', ...OFFSETS },
      422,
      'invalid_value',
      'blockId',
    );
    await refused(
      'PATCH',
      `/api/blocks/${tonight.id}`,
      { status: 'obtained', version: tonight.version },
      422,
      'invalid_value',
      'status',
    );
  });

  it('refuses a block in daylight, over another block, or for a target outside the campaign', async () => {
    const noon = await refused(
      'POST',
      '/api/blocks',
      block({ startUtc: '2026-06-10T16:00:00Z', endUtc: '2026-06-10T17:00:00Z' }),
      422,
      'invalid_value',
      'startUtc',
    );
    expect(noon.details.rule).toContain('darkness');
    const over = await refused(
      'POST',
      '/api/blocks',
      block({ startUtc: '2026-06-11T04:30:00Z', endUtc: '2026-06-11T05:30:00Z' }),
      409,
      'overlap',
      'startUtc',
    );
    expect(over.details.dependents).toEqual([{ entity: 'block', id: f.ids.block }]);
    await refused(
      'POST',
      '/api/blocks',
      block({
        targetId: otherTarget,
        startUtc: '2026-06-11T06:00:00Z',
        endUtc: '2026-06-11T06:30:00Z',
      }),
      422,
      'invalid_value',
      'targetId',
    );
    // An overlap a person explains is kept; touching blocks do not overlap.
    const shared = await created(
      '/api/blocks',
      block({
        startUtc: '2026-06-11T04:30:00Z',
        endUtc: '2026-06-11T05:30:00Z',
        overlapReason: 'second instrument on the same field',
      }),
    );
    expect((shared as unknown as { overlapReason: string }).overlapReason).toBe(
      'second instrument on the same field',
    );
    await created(
      '/api/blocks',
      block({ startUtc: '2026-06-11T05:30:00Z', endUtc: '2026-06-11T06:00:00Z' }),
    );
  });

  it('keeps a campaign’s dates, sites and targets over its nights and blocks', async () => {
    const path = `/api/campaigns/${f.ids.campaign}`;
    const end = await refused(
      'PATCH',
      path,
      { endDate: '2026-03-02' },
      409,
      'dependent_rows',
      'endDate',
    );
    expect(end.details.dependents).toContainEqual({ entity: 'night', id: f.ids.night });
    await refused('PATCH', path, { startDate: '2026-07-01' }, 409, 'dependent_rows', 'startDate');
    await refused('PATCH', path, { siteIds: [] }, 409, 'dependent_rows', 'siteIds');
    const targets = await refused(
      'PATCH',
      path,
      { targetIds: [otherTarget] },
      409,
      'dependent_rows',
      'targetIds',
    );
    expect(targets.details.dependents).toContainEqual({ entity: 'block', id: f.ids.block });
    const res = await f.call('lead', 'PATCH', path, { endDate: '2026-11-30' });
    expect(res.status, await res.text()).toBe(200);
  });

  it('refuses a site zone that would put its blocks outside their nights', async () => {
    const e = await refused(
      'PATCH',
      `/api/sites/${f.ids.site}`,
      // Confirmed, so the longitude–zone check lets it through to the rule under test.
      { timeZone: 'Asia/Tokyo', longitudeZoneConfirmed: true },
      409,
      'dependent_rows',
      'timeZone',
    );
    expect(e.details.dependents).toContainEqual({ entity: 'block', id: f.ids.block });
  });

  it('refuses moving a site where its blocks’ nights have no darkness; a move that keeps them dark passes', async () => {
    // Constructed case: at 69° N the June nights have no astronomical darkness (the Sun stays
    // above −18° all night north of 48.6° at the solstice: 90° − 23.4° − 18°, from memory).
    const e = await refused(
      'PATCH',
      `/api/sites/${f.ids.site}`,
      { latitudeDeg: 69 },
      409,
      'dependent_rows',
      'latitudeDeg',
    );
    expect(e.details.value).toBe(69);
    expect(e.details.dependents).toContainEqual({ entity: 'block', id: f.ids.block });
    // Half a degree south the same block stays in darkness: the edit passes, and is undone.
    const site = (await (await f.call('lead', 'GET', `/api/sites/${f.ids.site}`)).json()) as {
      latitudeDeg: number;
    };
    const moved = await f.call('lead', 'PATCH', `/api/sites/${f.ids.site}`, {
      latitudeDeg: site.latitudeDeg - 0.5,
    });
    expect(moved.status, await moved.clone().text()).toBe(200);
    const back = await f.call('lead', 'PATCH', `/api/sites/${f.ids.site}`, {
      latitudeDeg: site.latitudeDeg,
    });
    expect(back.status).toBe(200);
  });

  it('lets a horizon mask change under blocks: darkness is the Sun’s, not the horizon’s', async () => {
    const res = await f.call('lead', 'PATCH', `/api/sites/${f.ids.site}`, {
      horizonMask: [
        { azimuthDeg: 0, altitudeDeg: 20 },
        { azimuthDeg: 180, altitudeDeg: 25 },
      ],
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const b = await f.call('lead', 'GET', `/api/blocks/${f.ids.block}`);
    expect(b.status).toBe(200);
  });

  it('keeps a block’s measurements and outcome: no other target, night or status under them', async () => {
    // Both targets in the campaign, so the target rule of the block itself holds.
    const both = await f.call('lead', 'PATCH', `/api/campaigns/${f.ids.campaign}`, {
      targetIds: [f.ids.target, otherTarget],
    });
    expect(both.status, await both.text()).toBe(200);
    const night2 = await created('/api/nights', {
      siteId: f.ids.site,
      campaignId: f.ids.campaign,
      date: '2026-06-12',
    });
    const b = await created(
      '/api/blocks',
      block({ startUtc: '2026-06-11T07:00:00Z', endUtc: '2026-06-11T07:30:00Z' }),
    );
    const m = await created('/api/measurements', {
      targetId: f.ids.target,
      blockId: b.id,
      epoch: '2026-06-11T07:10:00Z',
      ...OFFSETS,
      dRaMas: 7,
    });
    const moved = await refused(
      'PATCH',
      `/api/blocks/${b.id}`,
      { targetId: otherTarget, version: b.version },
      409,
      'dependent_rows',
      'targetId',
    );
    expect(moved.details.dependents).toEqual([{ entity: 'measurement', id: m.id }]);
    await refused(
      'PATCH',
      `/api/blocks/${b.id}`,
      { kind: 'spectroscopy', version: b.version },
      409,
      'dependent_rows',
      'kind',
    );
    const report = await created('/api/night-reports', {
      nightId: f.ids.night,
      outcomes: [{ blockId: b.id, status: 'obtained' }],
    });
    const now = (await (await f.call('lead', 'GET', `/api/blocks/${b.id}`)).json()) as {
      version: number;
      status: string;
    };
    expect(now.status).toBe('obtained');
    const lost = await refused(
      'PATCH',
      `/api/blocks/${b.id}`,
      { status: 'lost', version: now.version },
      409,
      'dependent_rows',
      'status',
    );
    expect(lost.details.dependents).toEqual([{ entity: 'night report', id: report.id }]);
    await refused(
      'PATCH',
      `/api/blocks/${b.id}`,
      {
        nightId: night2.id,
        startUtc: '2026-06-13T07:00:00Z',
        endUtc: '2026-06-13T07:30:00Z',
        version: now.version,
      },
      409,
      'dependent_rows',
      'nightId',
    );
  });

  it('gives blocks their earlier status back when the report drops them or is deleted', async () => {
    const night = await created('/api/nights', {
      siteId: f.ids.site,
      campaignId: f.ids.campaign,
      date: '2026-06-20',
    });
    const a = await created(
      '/api/blocks',
      block({
        nightId: night.id,
        startUtc: '2026-06-21T04:00:00Z',
        endUtc: '2026-06-21T05:00:00Z',
      }),
    );
    const w = await created(
      '/api/blocks',
      block({
        nightId: night.id,
        status: 'withdrawn',
        startUtc: '2026-06-21T05:00:00Z',
        endUtc: '2026-06-21T06:00:00Z',
      }),
    );
    const statusOf = async (id: number) =>
      ((await (await f.call('lead', 'GET', `/api/blocks/${id}`)).json()) as { status: string })
        .status;
    const report = await created('/api/night-reports', {
      nightId: night.id,
      outcomes: [
        { blockId: a.id, status: 'obtained' },
        { blockId: w.id, status: 'lost' },
      ],
    });
    expect([await statusOf(a.id), await statusOf(w.id)]).toEqual(['obtained', 'lost']);
    // Rewritten twice: the earlier status is the one before the first report, not the report's own.
    const r1 = await f.call('lead', 'PATCH', `/api/night-reports/${report.id}`, {
      version: report.version,
      outcomes: [
        { blockId: a.id, status: 'partial' },
        { blockId: w.id, status: 'lost' },
      ],
    });
    expect(r1.status, await r1.clone().text()).toBe(200);
    const r2 = await f.call('lead', 'PATCH', `/api/night-reports/${report.id}`, {
      version: ((await r1.json()) as { version: number }).version,
      outcomes: [{ blockId: a.id, status: 'partial' }],
    });
    expect(r2.status, await r2.clone().text()).toBe(200);
    expect([await statusOf(a.id), await statusOf(w.id)]).toEqual(['partial', 'withdrawn']);
    const gone = await f.call('lead', 'DELETE', `/api/night-reports/${report.id}`);
    expect(gone.status, await gone.text()).toBe(204);
    expect([await statusOf(a.id), await statusOf(w.id)]).toEqual(['planned', 'withdrawn']);
  });

  it('refuses moving a night to a campaign without its blocks’ targets', async () => {
    const other = await created('/api/campaigns', {
      name: 'Rule other campaign',
      startDate: '2026-01-01',
      endDate: '2026-12-31',
      goals: { cadenceDays: 14, kinds: ['astrometry'] },
      targetIds: [otherTarget],
      siteIds: [f.ids.site],
    });
    const e = await refused(
      'PATCH',
      `/api/nights/${f.ids.night}`,
      { campaignId: other.id },
      409,
      'dependent_rows',
      'campaignId',
    );
    expect(e.details.dependents).toContainEqual({ entity: 'block', id: f.ids.block });
  });

  it('holds an import to the same rules, row by row, writing nothing', async () => {
    const before = await tableCounts(f.store);
    const csv = [
      'system,target,kind,epoch,blockId,dRaMas,dDecMas,sigmaDRaMas,sigmaDDecMas,instrument',
      `Test Deep,Wren,offsets,2026-06-11T04:40:00Z,${f.ids.block},5,6,0.3,0.3,imp`,
      `Test Deep,Wren,offsets,2026-06-15T04:40:00Z,${f.ids.block},5,6,0.3,0.3,imp`,
      'Test Deep,Wren,offsets,2027-01-01T04:40:00Z,,5,6,0.3,0.3,imp',
    ].join('\n');
    const res = await f.app.request('/api/imports/measurements', {
      method: 'POST',
      headers: { authorization: `Bearer ${f.tokens.observer}`, 'content-type': 'text/csv' },
      body: csv,
    });
    const json = (await res.json()) as ErrorBody;
    expect(res.status, JSON.stringify(json)).toBe(422);
    expect(json.error.details.problems!.map((p) => [p.line, p.column])).toEqual([
      [3, 'epoch'],
      [4, 'epoch'],
    ]); // constructed case: line 3 lies outside the block's night, line 4 after the clock
    expect(await tableCounts(f.store)).toEqual(before);
  });
});
