/**
 * The record commands: `system`, `target`, `site`, `campaign`, `night`s in bulk aside (allocate.ts),
 * `block` and `report`, each with `add`, `list`, `show` and (for records a log changes) `edit`.
 * One description per record (its options and the fields they fill, its table) and one runner
 * for all of them, through storeAction: the store's own checks apply (a site's longitude against
 * its zone, a misspelled zone's nearest names, a block's night and overlaps), and a refused
 * value is named by the option the user typed, with nothing written.
 */
import { parseArgs } from 'node:util';
import { InputError, refuseDecimalComma } from '../../science/errors.ts';
import type { Store } from '../../store/index.ts';
import { optionalId, outputFormat, positiveId, readJsonArg } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { render, type Column } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';

type Row = Record<string, unknown>;

/** How an option's text becomes a field's value. */
type Kind = 'text' | 'number' | 'id' | 'flag' | 'ids' | 'list' | 'outcomes';

interface FieldOption {
  option: string;
  /** The field it fills, dotted for nested ones (`goals.cadenceDays`). */
  field: string;
  kind: Kind;
  help: string;
}

/** The repositories the record commands reach, by name. */
type RepoName =
  | 'systems'
  | 'targets'
  | 'sites'
  | 'campaigns'
  | 'blocks'
  | 'nightReports'
  | 'measurements';

interface RecordSpec {
  /** Singular, as typed: `site`. */
  record: string;
  repo: RepoName;
  /** The HTTP collection: `/sites`. */
  path: string;
  summary: string;
  about: string;
  fields: FieldOption[];
  /** Options that narrow `list` (each a field of the list's filter and a query parameter). */
  filters?: { option: string; field: string }[];
  /** The record is versioned (blocks, reports): `edit` sends the version it read. */
  editable?: boolean;
  /** What a stored row shows with (members of a campaign, outcomes of a report). */
  view?: (store: Store, row: Row) => Promise<Row>;
  columns: Column<Row>[];
  /** Example lines for the help. */
  examples: string[];
}

const KINDS: readonly Kind[] = ['text', 'number', 'id', 'flag', 'ids', 'list', 'outcomes'];

/**
 * A record's fields as a table, one a line: the option, the field it fills, its kind, then the
 * help (the rest of the line). Read once, when the command is built: a kind not known is refused.
 */
function fieldTable(table: string): FieldOption[] {
  return table
    .split('\n')
    .filter((line) => line.trim() !== '')
    .map((line) => {
      const [option = '', field = '', kind = '', ...help] = line.trim().split(/\s+/);
      if (!(KINDS as readonly string[]).includes(kind))
        throw new Error(`field table: --${option} has kind ${JSON.stringify(kind)}`);
      return { option, field, kind: kind as Kind, help: help.join(' ') };
    });
}

const str = (k: string) => (r: Row) => (r[k] === null || r[k] === undefined ? '' : String(r[k]));
const num = (k: string) => (r: Row) => (typeof r[k] === 'number' ? (r[k] as number) : null);

/** A number typed at the command line: a decimal comma is refused with the fix, never dropped. */
function numberOf(option: string, text: string): number {
  refuseDecimalComma(text.trim(), `--${option}`, text);
  const x = Number(text);
  if (text.trim() === '' || !Number.isFinite(x))
    throw new InputError(`--${option}`, text, 'must be a number');
  return x;
}

/** `--outcome 40=obtained:35`: block 40 obtained, 35 minutes of exposure. */
function outcomeOf(text: string) {
  const m = /^\s*(\d+)\s*=\s*([a-z]+)\s*(?::\s*([^:]+))?$/.exec(text);
  if (!m)
    throw new InputError(
      '--outcome',
      text,
      'must be <block id>=<status>[:<exposure minutes>], e.g. 40=obtained or 41=partial:25',
    );
  return {
    blockId: positiveId('outcome', m[1]),
    status: m[2],
    ...(m[3] === undefined ? {} : { exposureMinutes: numberOf('outcome', m[3]) }),
  };
}

function fieldValue(f: FieldOption, text: string | boolean | string[]): unknown {
  if (f.kind === 'flag') return text === true;
  if (f.kind === 'outcomes') return (text as string[]).map(outcomeOf);
  const t = String(text);
  switch (f.kind) {
    case 'number':
      return numberOf(f.option, t);
    case 'id':
      return positiveId(f.option, t);
    case 'ids':
      return t
        .split(',')
        .filter((s) => s.trim() !== '')
        .map((s) => positiveId(f.option, s.trim()));
    case 'list':
      return t
        .split(',')
        .map((s) => s.trim())
        .filter(Boolean);
    default:
      return t;
  }
}

function setPath(target: Row, path: string, value: unknown): void {
  const keys = path.split('.');
  let o = target;
  for (const k of keys.slice(0, -1)) {
    if (typeof o[k] !== 'object' || o[k] === null) o[k] = {};
    o = o[k] as Row;
  }
  o[keys.at(-1)!] = value;
}

/** The store's field, renamed after the option that filled it (the longest dotted prefix that has one). */
function asOption(spec: RecordSpec, err: unknown): never {
  if (!(err instanceof InputError)) throw err;
  const parts = err.field.split('.');
  for (let n = parts.length; n > 0; n--) {
    const f = spec.fields.find((x) => x.field === parts.slice(0, n).join('.'));
    if (f) {
      const rest = parts.slice(n).join('.');
      // A rule that names another field (confirm with longitudeZoneConfirmed: true) names its
      // option; only code names (camelCase) are looked for, never words such as "name".
      let rule = err.rule;
      for (const o of spec.fields)
        if (/^[a-z]+[A-Z][A-Za-z]*$/.test(o.field))
          rule = rule.replaceAll(new RegExp(`\\b${o.field}\\b(: true)?`, 'g'), `--${o.option}`);
      throw new InputError(`--${f.option}${rest ? ` ${rest}` : ''}`, err.value, rule);
    }
  }
  throw err;
}

function helpOf(spec: RecordSpec): string {
  const width = Math.max(
    ...spec.fields.map((f) => f.option.length + 2 + (f.kind === 'flag' ? 0 : 4)),
  );
  const line = (f: FieldOption) =>
    `  ${`--${f.option}${f.kind === 'flag' ? '' : ' <x>'}`.padEnd(Math.max(width, 21))}  ${f.help}`;
  const id = `--${spec.record}-id <id>`;
  const filters = spec.filters?.length
    ? ` [${spec.filters.map((f) => `--${f.option} <id>`).join('] [')}]`
    : '';
  const edit = spec.editable ? `\n       epochwright ${spec.record} edit ${id} [options]` : '';
  return `usage: epochwright ${spec.record} add [options] [--record <json|file>]
       epochwright ${spec.record} list${filters} [--json | --csv]
       epochwright ${spec.record} show ${id} [--json]${edit}

${spec.about}

add stores one ${spec.record}, all of it or nothing: a refused value is named with its option and
rule, and nothing is written. --record gives the whole record as JSON (fields as in the HTTP API);
options given beside it replace its fields.${
    spec.editable
      ? `\nedit changes the options given and keeps the rest (the version read is sent along, so a ` +
        `change\nmade meanwhile by someone else is refused rather than overwritten).`
      : ''
  }

fields:
${spec.fields.map(line).join('\n')}

options:
${STORE_HELP}
  --json | --csv         machine-readable output instead of a table

examples:
${spec.examples.map((e) => `  ${e}`).join('\n')}
`;
}

/** The repository calls the record commands make, whichever repository the spec names. */
interface RecordRepo {
  create(actor: unknown, input: unknown): Promise<Row>;
  get(id: number): Promise<Row>;
  list(filter: Row, page: { limit: number }): Promise<{ items: Row[] }>;
  update(actor: unknown, id: number, patch: Row, version?: number): Promise<Row>;
}

type Values = Record<string, string | boolean | string[] | undefined>;

/** What each action of one run shares: the spec, the parsed options, the output format. */
interface RecordRun {
  spec: RecordSpec;
  idOption: string;
  values: Parameters<typeof storeAction>[0];
  v: Values;
  format: ReturnType<typeof outputFormat>;
  repo: (store: Store) => RecordRepo;
  view: (store: Store, row: Row) => Row | Promise<Row>;
  /** The fields the options give, as a (nested) body. */
  fieldsGiven: () => Row;
  show: (rows: Row[]) => string;
}

/** The parseArgs options of a record's command: the store's, the id, --record, the fields, the filters. */
function recordOptions(spec: RecordSpec, idOption: string) {
  return {
    ...storeOptions,
    [idOption]: { type: 'string' },
    record: { type: 'string' },
    json: { type: 'boolean' },
    csv: { type: 'boolean' },
    ...Object.fromEntries(
      spec.fields.map((f) => [
        f.option,
        f.kind === 'flag'
          ? { type: 'boolean' }
          : f.kind === 'outcomes'
            ? { type: 'string', multiple: true }
            : { type: 'string' },
      ]),
    ),
    ...Object.fromEntries((spec.filters ?? []).map((f) => [f.option, { type: 'string' }])),
  } as const;
}

/** One record's command. */
export function recordCommand(spec: RecordSpec): Command {
  const idOption = `${spec.record}-id`;
  const options = recordOptions(spec, idOption);
  const repo = (store: Store) => store[spec.repo] as unknown as RecordRepo;
  const view = (store: Store, row: Row) => (spec.view ? spec.view(store, row) : row);
  return {
    summary: spec.summary,
    help: helpOf(spec),
    async run(argv) {
      const { values, positionals } = parseArgs({
        args: argv,
        options,
        strict: true,
        allowPositionals: true,
      });
      const v = values as Values;
      const [action, ...extra] = positionals;
      if (extra.length) throw new UsageError(`unexpected ${JSON.stringify(extra[0])}`);
      const format = outputFormat(values);
      const fieldsGiven = (): Row => {
        const body: Row = {};
        for (const f of spec.fields)
          if (v[f.option] !== undefined) setPath(body, f.field, fieldValue(f, v[f.option]!));
        return body;
      };
      const show = (rows: Row[]) =>
        render(format, rows, spec.columns, rows.length === 1 && action !== 'list' ? rows[0] : rows);
      const r: RecordRun = { spec, idOption, values, v, format, repo, view, fieldsGiven, show };
      switch (action) {
        case 'add':
          return addRecord(r);
        case 'edit':
          if (!spec.editable) throw new UsageError(`${spec.record}: say add, list or show`);
          return editRecord(r);
        case 'list':
          return listRecords(r);
        case 'show':
          return showRecord(r);
        default:
          throw new UsageError(
            `${spec.record}: say add, list, show${spec.editable ? ' or edit' : ''}` +
              (action ? ` (not ${JSON.stringify(action)})` : ''),
          );
      }
    },
  };
}

async function addRecord(r: RecordRun): Promise<string> {
  const { spec, v } = r;
  const given = v.record === undefined ? {} : readJsonArg('record', v.record as string);
  if (typeof given !== 'object' || given === null || Array.isArray(given))
    throw new UsageError('--record must be a JSON object (one record)');
  const body = merge(given as Row, r.fieldsGiven());
  const row = await storeAction(r.values, {
    local: (store, actor) =>
      r
        .repo(store)
        .create(actor, body)
        .then((x) => r.view(store, x)),
    remote: { method: 'POST', path: spec.path, body },
    writes: true,
  }).catch((e: unknown) => asOption(spec, e));
  return r.format === 'table'
    ? `stored ${spec.record} ${row.id}${row.name ? ` ${JSON.stringify(row.name)}` : ''}\n${r.show([row])}`
    : r.show([row]);
}

/** Changes the fields given, sending the version read so a change made meanwhile is refused. */
async function editRecord(r: RecordRun): Promise<string> {
  const { spec } = r;
  const id = positiveId(r.idOption, r.v[r.idOption] as string | undefined);
  const patch = r.fieldsGiven();
  if (Object.keys(patch).length === 0)
    throw new UsageError(`${spec.record} edit: give at least one field to change`);
  const row = await storeAction(r.values, {
    local: async (store, actor) => {
      const read = await r.repo(store).get(id);
      return r.view(store, await r.repo(store).update(actor, id, patch, read.version as number));
    },
    remote: async (api) => {
      const read = await api<Row>({ method: 'GET', path: `${spec.path}/${id}` });
      return api<Row>({
        method: 'PATCH',
        path: `${spec.path}/${id}`,
        body: { ...patch, version: read.version },
      });
    },
    writes: true,
  }).catch((e: unknown) => asOption(spec, e));
  return r.format === 'table'
    ? `changed ${spec.record} ${row.id} (now version ${row.version})\n${r.show([row])}`
    : r.show([row]);
}

async function listRecords(r: RecordRun): Promise<string> {
  const { spec } = r;
  const filter: Row = {};
  for (const f of spec.filters ?? []) {
    const id = optionalId(f.option, r.v[f.option] as string | undefined);
    if (id !== undefined) filter[f.field] = id;
  }
  const rows = await storeAction(r.values, {
    local: async (store) =>
      Promise.all(
        (await r.repo(store).list(filter, { limit: 500 })).items.map((x) => r.view(store, x)),
      ),
    remote: async (api) =>
      (
        await api<{ items: Row[] }>({
          method: 'GET',
          path: spec.path,
          query: { ...(filter as Record<string, number>), limit: 500 },
        })
      ).items,
  });
  if (r.format === 'table' && rows.length === 0)
    return `no ${spec.record} stored yet: add one with 'epochwright ${spec.record} add' (see --help)\n`;
  return r.show(rows);
}

async function showRecord(r: RecordRun): Promise<string> {
  const id = positiveId(r.idOption, r.v[r.idOption] as string | undefined);
  const row = await storeAction(r.values, {
    local: async (store) => r.view(store, await r.repo(store).get(id)),
    remote: { method: 'GET', path: `${r.spec.path}/${id}` },
  });
  return r.format === 'table' ? describe(r.spec, row) : r.show([row]);
}

/** One record for people: each field under the option that sets it, blanks left out. */
function describe(spec: RecordSpec, row: Row): string {
  const at = (path: string) =>
    path
      .split('.')
      .reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Row)[k] : undefined), row);
  const shown = (x: unknown): string =>
    typeof x === 'number'
      ? String(Number(x.toFixed(6)))
      : Array.isArray(x)
        ? x.map((v) => (typeof v === 'object' ? JSON.stringify(v) : String(v))).join(', ')
        : typeof x === 'boolean'
          ? x
            ? 'yes'
            : 'no'
          : String(x);
  const lines: [string, string][] = [[`${spec.record}-id`, String(row.id)]];
  for (const f of spec.fields) {
    const x =
      f.kind === 'outcomes'
        ? (row.outcomes as { blockId: number; status: string }[] | undefined)?.map(
            (o) => `${o.blockId}=${o.status}`,
          )
        : at(f.field);
    if (x === undefined || x === null || x === '' || (Array.isArray(x) && x.length === 0)) continue;
    lines.push([f.option, shown(x)]);
  }
  for (const k of ['origin', 'version', 'createdAt', 'updatedAt'] as const)
    if (row[k] !== undefined && row[k] !== null)
      lines.push([
        { createdAt: 'stored (UTC)', updatedAt: 'changed (UTC)' }[k as string] ?? k,
        String(row[k]),
      ]);
  const width = Math.max(...lines.map(([k]) => k.length));
  return `${lines.map(([k, v]) => `${k.padEnd(width)}  ${v}`).join('\n')}\n`;
}

/** `--record`'s record with the options' fields over it (nested objects merged, not replaced). */
function merge(base: Row, over: Row): Row {
  const out: Row = { ...base };
  for (const [k, x] of Object.entries(over)) {
    const b = out[k];
    out[k] =
      typeof x === 'object' &&
      x !== null &&
      !Array.isArray(x) &&
      typeof b === 'object' &&
      b &&
      !Array.isArray(b)
        ? merge(b as Row, x as Row)
        : x;
  }
  return out;
}

export const systemCommand = recordCommand({
  record: 'system',
  repo: 'systems',
  path: '/systems',
  summary: 'add, list and show systems (a primary at its ICRS position)',
  about:
    'A system is one primary (a compact object or a primary star) at its ICRS position, with\n' +
    'its distance and mass estimates; its stars are targets (epochwright target add).',
  fields: fieldTable(`
    name            name           text    the system’s name
    ra              raDeg          text    ICRS right ascension: 250.3 (degrees), 16.69h, 16:41:12.5 (hours)
    dec             decDeg         text    ICRS declination: -26.69, -26:41:12, -26°41′12″
    position-epoch  positionEpoch  text    epoch of the position (default J2000.0)
    pm-ra           pmRaMasYr      number  proper motion μα* = μα·cos δ, mas/yr (default 0)
    pm-dec          pmDecMasYr     number  proper motion μδ, mas/yr (default 0)
    distance-pc     distancePc     number  distance, parsec
    mass            massSolar      number  mass estimate of the primary, solar masses
    notes           notes          text    free text
  `),
  columns: [
    { header: 'id', value: num('id') },
    { header: 'name', value: str('name') },
    { header: 'ra_deg', value: num('raDeg'), digits: 6 },
    { header: 'dec_deg', value: num('decDeg'), digits: 6 },
    { header: 'distance_pc', value: num('distancePc') },
    { header: 'mass_solar', value: num('massSolar') },
  ],
  examples: [
    "epochwright system add --name 'Hollow Lamp' --ra 17:35:22.1 --dec -21:42:58 --distance-pc 15000 --mass 2e7",
  ],
});

export const targetCommand = recordCommand({
  record: 'target',
  repo: 'targets',
  path: '/targets',
  summary: 'add, list and show targets (stars of a system)',
  about:
    'A target is a star orbiting a system’s primary. Its orbit solutions come by\n' +
    '`epochwright import --kind orbits` or a fit (`epochwright fit --target-id <id> --accept`).',
  fields: fieldTable(`
    system-id  systemId   id      the system it orbits
    name       name       text    the star’s name
    magnitude  magnitude  number  apparent magnitude in --band
    band       band       text    photometric band of the magnitude (K, H, …)
    notes      notes      text    free text
  `),
  filters: [{ option: 'system-id', field: 'systemId' }],
  columns: [
    { header: 'id', value: num('id') },
    { header: 'system_id', value: num('systemId') },
    { header: 'name', value: str('name') },
    { header: 'magnitude', value: num('magnitude') },
    { header: 'band', value: str('band') },
  ],
  examples: ["epochwright target add --system-id 1 --name 'Lamp-7' --magnitude 14.1 --band K"],
});

export const siteCommand = recordCommand({
  record: 'site',
  repo: 'sites',
  path: '/sites',
  summary: 'add, list and show observing sites (a longitude that contradicts the zone is refused)',
  about:
    'An observing site: where it is, its IANA time zone and its pointing limits. A longitude that\n' +
    'disagrees with the zone by more than 3 hours (a flipped sign, most often) is refused with the\n' +
    'likely correction; give --longitude-zone-confirmed to keep it (a station on another place’s\n' +
    'clock). A misspelled zone is refused with the nearest valid names. Its precision model:\n' +
    '`epochwright site-precision`.',
  fields: fieldTable(`
    name                      name                    text    the site’s name
    latitude                  latitudeDeg             text    geodetic latitude, north positive: -24.6, -24:37:38
    longitude                 longitudeDeg            text    longitude, east positive: -70.4, -70:24:10
    elevation                 elevationM              number  elevation above the ellipsoid, metres
    time-zone                 timeZone                text    IANA time zone, e.g. America/Santiago
    longitude-zone-confirmed  longitudeZoneConfirmed  flag    the longitude and the zone disagree, and that is meant
    lowest-altitude           lowestAltitudeDeg       number  lowest usable altitude, degrees (default 30)
    least-sun-distance        leastSunDistanceDeg     number  closest allowed angle to the Sun, degrees (default 45)
    pressure                  pressureHpa             number  typical pressure for refraction, hPa
    temperature               temperatureC            number  typical night temperature, °C
    humidity                  humidityPct             number  typical relative humidity, % (default 50)
    wavelength                wavelengthUm            number  wavelength observed, µm (default 2.2)
    laser-guide-star          laserGuideStar          flag    the site runs a laser guide star
    notes                     notes                   text    free text
  `),
  columns: [
    { header: 'id', value: num('id') },
    { header: 'name', value: str('name') },
    { header: 'latitude_deg', value: num('latitudeDeg'), digits: 4 },
    { header: 'longitude_deg', value: num('longitudeDeg'), digits: 4 },
    { header: 'elevation_m', value: num('elevationM'), digits: 0 },
    { header: 'time_zone', value: str('timeZone') },
    { header: 'lowest_altitude_deg', value: num('lowestAltitudeDeg'), digits: 0 },
    { header: 'laser', value: (r) => (r.laserGuideStar ? 'yes' : '') },
  ],
  examples: [
    "epochwright site add --name 'Cerro Tanagra' --latitude -29:15:40 --longitude -70:44:10 --elevation " +
      '2380 --time-zone America/Santiago',
  ],
});

const ids = (k: string) => (r: Row) => (Array.isArray(r[k]) ? (r[k] as number[]).join(',') : '');
export const campaignCommand = recordCommand({
  record: 'campaign',
  repo: 'campaigns',
  path: '/campaigns',
  summary: 'add, list and show campaigns (targets, sites, goals over a date range)',
  about:
    'A campaign follows its targets from its sites over a date range, with goals (cadence, a\n' +
    'denser cadence near periapsis, the kinds of measurement) and limits. Its allocated nights:\n' +
    '`epochwright allocate`. Other goals (per-target settings, precision): --record with the JSON.',
  fields: fieldTable(`
    name                 name                         text    the campaign’s name
    start                startDate                    text    first night, YYYY-MM-DD (local evening date)
    end                  endDate                      text    last night, YYYY-MM-DD
    target-ids           targetIds                    ids     its targets, comma-separated ids
    site-ids             siteIds                      ids     its sites, comma-separated ids
    cadence-days         goals.cadenceDays            number  wanted interval between epochs of a target, days
    kinds                goals.kinds                  list    astrometry, spectroscopy or both (comma-separated)
    dense-cadence-days   goals.densifiedCadenceDays   number  the interval near periapsis, days
    dense-within-days    goals.densifyWithinDays      number  how close to periapsis the dense cadence applies, days
    highest-airmass      limits.highestAirmass        number  highest airmass (default 2)
    least-moon-distance  limits.leastMoonDistanceDeg  number  least Moon distance while it is up, degrees
    darkness             limits.darkness              text    civil, nautical or astronomical (default)
    notes                notes                        text    free text
  `),
  view: (store, row) => store.campaigns.withMembers(row as never) as Promise<Row>,
  columns: [
    { header: 'id', value: num('id') },
    { header: 'name', value: str('name') },
    { header: 'start', value: str('startDate') },
    { header: 'end', value: str('endDate') },
    { header: 'target_ids', value: ids('targetIds') },
    { header: 'site_ids', value: ids('siteIds') },
    {
      header: 'cadence_d',
      value: (r) => (r.goals as { cadenceDays?: number } | undefined)?.cadenceDays ?? null,
    },
    {
      header: 'kinds',
      value: (r) => ((r.goals as { kinds?: string[] } | undefined)?.kinds ?? []).join(','),
    },
  ],
  examples: [
    "epochwright campaign add --name 'Lamp passage' --start 2027-03-01 --end 2027-10-31 --target-ids 1,2 " +
      '--site-ids 1 --cadence-days 14 --kinds astrometry,spectroscopy',
  ],
});

export const blockCommand = recordCommand({
  record: 'block',
  repo: 'blocks',
  path: '/blocks',
  summary: 'add, list, show and edit blocks by hand (a past night’s too: what really ran)',
  about:
    'A block is an interval of a stored night for one target and one kind of measurement. Blocks\n' +
    'added here are by hand; a block of a night that has ended records what ran (--status obtained,\n' +
    'partial or lost, with its real --start and --end). Plans come from plan-season and plan-night.',
  fields: fieldTable(`
    night-id          nightId         id    the stored night (see epochwright allocate)
    target-id         targetId        id    the target
    kind              kind            text  astrometry or spectroscopy
    start             startUtc        text  start: ISO 8601 with a zone (2027-06-06T02:10-04), JD, MJD
    end               endUtc          text  end, as --start
    status            status          text  planned (default), obtained, partial, lost or withdrawn
    laser-guide-star  laserGuideStar  flag  the block uses the site’s laser guide star
    pinned            pinned          flag  keep it where it is: no accepted plan replaces it
    overlap-reason    overlapReason   text  why it may overlap another block of its site
    notes             notes           text  free text
  `),
  filters: [
    { option: 'night-id', field: 'nightId' },
    { option: 'target-id', field: 'targetId' },
  ],
  editable: true,
  columns: [
    { header: 'id', value: num('id') },
    { header: 'night_id', value: num('nightId') },
    { header: 'target_id', value: num('targetId') },
    { header: 'kind', value: str('kind') },
    { header: 'start_utc', value: (r) => str('startUtc')(r).slice(0, 16).replace('T', ' ') },
    { header: 'end_utc', value: (r) => str('endUtc')(r).slice(0, 16).replace('T', ' ') },
    { header: 'status', value: str('status') },
    { header: 'origin', value: str('origin') },
    { header: 'version', value: num('version') },
  ],
  examples: [
    'epochwright block add --night-id 12 --target-id 1 --kind astrometry --start 2027-05-03T04:10Z --end ' +
      '2027-05-03T04:50Z --status obtained',
    'epochwright block edit --block-id 40 --status partial --end 2027-05-03T04:35Z',
  ],
});

export const reportCommand = recordCommand({
  record: 'report',
  repo: 'nightReports',
  path: '/night-reports',
  summary: 'add, list, show and edit night reports: conditions, time lost, each block’s outcome',
  about:
    'The log of a night that has ended: seeing, adaptive-optics Strehl ratio, clouds, time lost and\n' +
    'why, and the outcome of each block (--outcome <block id>=<status>, repeatable, or --record with\n' +
    'the JSON). Its measurements: `epochwright import --kind measurements` (with blockId).',
  fields: fieldTable(`
    night-id          nightId         id        the stored night
    seeing            seeingArcsec    number    seeing FWHM at zenith, arcsec
    strehl            strehlRatio     number    adaptive-optics Strehl ratio, 0–1
    cloud-cover       cloudCoverPct   number    cloud cover, %
    humidity          humidityPct     number    relative humidity, %
    wind              windMS          number    wind speed, m/s
    temperature       temperatureC    number    temperature, °C
    time-lost         timeLostHours   number    hours lost (default 0); 1.5, not 1,5
    time-lost-reason  timeLostReason  text      why (clouds, wind, a fault)
    outcome           outcomes        outcomes  <block id>=<status>[:<exposure minutes>], repeatable
    notes             notes           text      free text
  `),
  filters: [{ option: 'night-id', field: 'nightId' }],
  editable: true,
  view: (store, row) => store.nightReports.withOutcomes(row as never) as Promise<Row>,
  columns: [
    { header: 'id', value: num('id') },
    { header: 'night_id', value: num('nightId') },
    { header: 'seeing_arcsec', value: num('seeingArcsec'), digits: 2 },
    { header: 'strehl', value: num('strehlRatio'), digits: 2 },
    { header: 'lost_h', value: num('timeLostHours'), digits: 1 },
    { header: 'reason', value: str('timeLostReason') },
    {
      header: 'outcomes',
      value: (r) =>
        ((r.outcomes as { blockId: number; status: string }[] | undefined) ?? [])
          .map((o) => `${o.blockId}=${o.status}`)
          .join(' '),
    },
  ],
  examples: [
    'epochwright report add --night-id 12 --seeing 0.7 --strehl 0.45 --time-lost 1.5 --time-lost-reason ' +
      "'cirrus after 03:00' --outcome 40=obtained --outcome 41=lost",
  ],
});

export const measurementCommand = recordCommand({
  record: 'measurement',
  repo: 'measurements',
  path: '/measurements',
  summary: 'add, list and show measurements one at a time (a file: epochwright import)',
  about:
    'One astrometric position or radial velocity of a target at an epoch, with its 1σ and the\n' +
    'instrument; give the block it came from (--block-id) so the site learns its precision. Many at\n' +
    'once: `epochwright import --kind measurements`.',
  fields: fieldTable(`
    target-id             targetId                id      the target
    block-id              blockId                 id      the block it was obtained in
    kind                  kind                    text    offsets, separation or radial-velocity
    component             component               text    relative (default), or primary/secondary for a radial velocity
    epoch                 epoch                   text    when: ISO 8601 with a zone, JD, MJD, J2027.35
    dra                   dRaMas                  number  offsets: Δα* = Δα·cos δ, mas (east positive)
    ddec                  dDecMas                 number  offsets: Δδ, mas (north positive)
    sigma-dra             sigmaDRaMas             number  offsets: 1σ of Δα*, mas
    sigma-ddec            sigmaDDecMas            number  offsets: 1σ of Δδ, mas
    correlation           correlation             number  offsets, separation: correlation of the two errors
    separation            separationMas           number  separation: ρ, mas
    position-angle        positionAngleDeg        number  separation: θ from north through east, degrees
    sigma-separation      sigmaSeparationMas      number  separation: 1σ of ρ, mas
    sigma-position-angle  sigmaPositionAngleDeg   number  separation: 1σ of θ, degrees
    rv                    radialVelocityKmS       number  radial-velocity: km/s, receding positive
    sigma-rv              sigmaRadialVelocityKmS  number  radial-velocity: 1σ, km/s
    instrument            instrument              text    the instrument
    notes                 notes                   text    free text
  `),
  filters: [
    { option: 'target-id', field: 'targetId' },
    { option: 'block-id', field: 'blockId' },
  ],
  columns: [
    { header: 'id', value: num('id') },
    { header: 'target_id', value: num('targetId') },
    { header: 'kind', value: str('kind') },
    { header: 'epoch_utc', value: (r) => str('epoch')(r).slice(0, 19).replace('T', ' ') },
    {
      header: 'value',
      value: (r) =>
        r.kind === 'radial-velocity'
          ? `${(r.radialVelocityKmS as number).toFixed(2)} ± ${(r.sigmaRadialVelocityKmS as number).toFixed(2)} km/s`
          : r.kind === 'offsets'
            ? `Δα* ${(r.dRaMas as number).toFixed(3)} ± ${(r.sigmaDRaMas as number).toFixed(3)}, Δδ ` +
              `${(r.dDecMas as number).toFixed(3)} ± ${(r.sigmaDDecMas as number).toFixed(3)} mas`
            : `ρ ${(r.separationMas as number).toFixed(3)} ± ${(r.sigmaSeparationMas as number).toFixed(3)} ` +
              `mas, θ ${(r.positionAngleDeg as number).toFixed(3)} ± ` +
              `${(r.sigmaPositionAngleDeg as number).toFixed(3)}°`,
    },
    { header: 'block_id', value: num('blockId') },
    { header: 'instrument', value: str('instrument') },
  ],
  examples: [
    'epochwright measurement add --target-id 1 --block-id 40 --kind offsets --epoch 2027-05-03T04:30Z ' +
      "--dra 12.41 --ddec -40.32 --sigma-dra 0.8 --sigma-ddec 0.8 --instrument 'imager K'",
  ],
});
