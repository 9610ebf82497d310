/** `epochwright plan-season`: a stored campaign's season plan; `--accept` stores it as blocks. */
import { SEASON_SETTINGS, type PlannedEpoch } from '../../science/plan/index.ts';
import {
  ACCEPT_AT_TOLERANCE_MINUTES,
  type SeasonPlanRequest,
  type Store,
} from '../../store/index.ts';
import { UsageError, type Command } from '../io.ts';
import {
  asOptions,
  checkAcceptDigest,
  commandArgs,
  positiveId,
  readJsonArg,
  weatherOption,
} from '../args.ts';
import { formatTable, plural, render, type Column } from '../output.ts';
import { renderDraws } from './season-draws-output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';
import { momentJd } from '../../clock.ts';

const help = `usage: epochwright plan-season --campaign-id <id> --start <YYYY-MM-DD> --end <YYYY-MM-DD> [options]

The epochs a stored campaign should observe from --start to --end. First every observable
allocated site-night in the window of each coming periapsis passage (± k σ of its date), then one
site-night in every cadence window (per-target cadence and priority), the one that most tightens
the orbit at the precision it would have there (σ ∝ seeing ∝ airmass^0.6); each timed by the night
scheduler. Shows the expected σ and the gain of each epoch, the coverage of each passage, every
unused night of a periapsis window and every unmet goal with the limit that closed each night, and
the 1σ of the coming passage's date and of the mass before → after.

Nothing is written unless --accept is given. Accepting replaces the blocks of the open nights that
are still only plans; obtained, logged, measured, begun, hand-made or pinned blocks, and their
nights, are kept.

options:
  --campaign-id <id>     the campaign
  --start, --end <date>  first and last night (local evening dates) within the campaign
  --site-id <id>         plan for this site of the campaign only (repeatable); default all
  --all-nights           plan every night of the range, not only the campaign's stored nights
  --at <epoch>           the moment of planning (ISO 8601, JD, MJD); default now. With --accept
                         it may not lie more than ${ACCEPT_AT_TOLERANCE_MINUTES} min before the clock
  --settings <json|file> planner settings over the campaign's: { blockMinutes: { astrometry,
                         spectroscopy }, precision: { astrometryMas, spectroscopyKmS,
                         referenceSeeingArcsec }, slotMinutes, slewMinutes, sameTargetMinutes,
                         fillFraction, extraEpochsPerTarget, periapsisWindowSigma,
                         coverageWithinDays, laserGuideStar: { astrometry, spectroscopy },
                         periapsisRepeat: "single" | "fill" | { step: "PT2H" },
                         backupLossAbove, relativityGoal: true | false }
  --weather aware|blind  aware (default): weigh each night by its site's learned chance of being
                         clear (site-statistics) and back up critical epochs on likely-lost
                         nights; blind: every night weighs 1
  --draws <n> [--seed <s>]  instead of the plan, draw its season n times (each night lost at its
                         site's learned chance, precision scattered per night): percentiles of the
                         final σ of the passage date, the mass and the relativity factors, and of
                         the passage's coverage; seed default 1
  --accept               store the plan (as the local operator, or the token's user with --server)
  --digest <hex>         with --accept: refuse if the plan differs from the preview with this digest
${STORE_HELP}
  --json | --csv         machine-readable output instead of a table
`;

const SETTINGS: readonly string[] = SEASON_SETTINGS;
const OPTIONS = {
  startDate: '--start',
  endDate: '--end',
  siteIds: '--site-id',
  nights: '--all-nights',
  campaignId: '--campaign-id',
  at: '--at',
  '*': '--settings',
};

export const planSeasonCommand: Command = {
  summary: 'season plan of a stored campaign: epochs, reasons, unmet goals (--accept stores it)',
  help,
  async run(argv) {
    const { values, format } = commandArgs(argv, {
      ...storeOptions,
      'campaign-id': { type: 'string' },
      start: { type: 'string' },
      end: { type: 'string' },
      'site-id': { type: 'string', multiple: true },
      'all-nights': { type: 'boolean' },
      at: { type: 'string' },
      settings: { type: 'string' },
      accept: { type: 'boolean' },
      digest: { type: 'string' },
      weather: { type: 'string' },
      draws: { type: 'string' },
      seed: { type: 'string' },
    });
    const id = positiveId('campaign-id', values['campaign-id']);
    if (values.start === undefined || values.end === undefined)
      throw new UsageError('--start and --end are required (local evening dates, YYYY-MM-DD)');
    checkAcceptDigest(values);
    const settings = values.settings === undefined ? {} : readJsonArg('settings', values.settings);
    if (typeof settings !== 'object' || settings === null || Array.isArray(settings))
      throw new UsageError('--settings must be a JSON object');
    for (const k of Object.keys(settings))
      if (!SETTINGS.includes(k))
        throw new UsageError(
          `--settings: unknown setting ${JSON.stringify(k)} (known: ${SETTINGS.join(', ')})`,
        );
    const weather = weatherOption(values.weather);
    if ((values.draws !== undefined || values.seed !== undefined) && values.accept)
      throw new UsageError('--draws and --seed preview only: leave out --accept');
    if (values.seed !== undefined && values.draws === undefined)
      throw new UsageError('--seed goes with --draws');
    const atJd = momentJd(values.at, '--at');
    const request: SeasonPlanRequest = {
      ...(settings as object),
      startDate: values.start,
      endDate: values.end,
      ...(values['site-id']
        ? { siteIds: values['site-id'].map((s) => positiveId('site-id', s)) }
        : {}),
      nights: values['all-nights'] ? 'all' : 'allocated',
      weather,
      ...(values.digest !== undefined ? { digest: values.digest } : {}),
    };
    if (values.draws !== undefined) {
      const draws = positiveId('draws', values.draws);
      const seed = values.seed === undefined ? 1 : Number(values.seed);
      if (!Number.isInteger(seed) || seed < 0)
        throw new UsageError(`--seed: ${JSON.stringify(values.seed)} must be a whole number ≥ 0`);
      const drawn = { ...request, draws, seed };
      const view = await asOptions({ ...OPTIONS, draws: '--draws', seed: '--seed' }, () =>
        storeAction(values, {
          local: (store) => store.plans.seasonDraws(id, drawn, atJd),
          remote: {
            method: 'POST',
            path: `/campaigns/${id}/season-plan/draws`,
            body: { ...drawn, at: values.at },
          },
        }),
      );
      return renderDraws(view, format);
    }
    type Accepted = Awaited<ReturnType<Store['plans']['acceptSeason']>>;
    const result: Awaited<ReturnType<Store['plans']['previewSeason']>> & Partial<Accepted> =
      await asOptions(OPTIONS, () =>
        storeAction(values, {
          local: (store, actor) =>
            values.accept
              ? store.plans.acceptSeason(actor, id, request, atJd)
              : store.plans.previewSeason(id, request, atJd),
          remote: {
            method: 'POST',
            path: `/campaigns/${id}/season-plan${values.accept ? '/accept' : ''}`,
            body: { ...request, at: values.at },
          },
          writes: values.accept === true,
        }),
      );
    const columns: Column<PlannedEpoch>[] = [
      { header: 'night', value: (e) => e.date },
      { header: 'site', value: (e) => e.site },
      {
        header: format === 'table' ? 'start_local' : 'start_utc',
        value: (e) =>
          format === 'table'
            ? e.block.start.local.slice(0, 16).replace('T', ' ')
            : e.block.start.utc,
      },
      { header: 'minutes', value: (e) => e.block.minutes, digits: 0 },
      { header: 'target', value: (e) => e.target },
      { header: 'kind', value: (e) => e.kind },
      { header: 'airmass', value: (e) => e.block.airmassMiddle, digits: 2 },
      {
        header: 'sigma',
        value: (e) =>
          format === 'table'
            ? `${e.precision.sigma.toFixed(e.precision.unit === 'mas' ? 2 : 1)} ${e.precision.unit}`
            : e.precision.sigma,
      },
      ...(format === 'table'
        ? []
        : [{ header: 'sigma_unit', value: (e: PlannedEpoch) => e.precision.unit }]),
      { header: 'why', value: (e) => e.why },
      { header: 'gain', value: (e) => e.gain.text },
      ...(format === 'table' ? [] : [{ header: 'reason', value: (e: PlannedEpoch) => e.reason }]),
    ];
    const plan = result.plan;
    if (format !== 'table') return render(format, plan.epochs, columns, result);
    const stored = result;
    const written =
      stored.written && stored.nightsCreated
        ? `accepted: ${plural(stored.written.length, 'block')} written, ${result.replaces.length} ` +
          `replaced, ${plural(stored.nightsCreated.length, 'night')} created\n`
        : `preview only (digest ${result.digest}): accepting would replace ${result.replaces.length} ` +
          `stored blocks; run again with --accept to store it\n`;
    const sigma = (x: number | null, d: number) => (x === null ? '—' : x.toFixed(d));
    const pct = (x: number) => `${(100 * x).toFixed(0)} %`;
    const targets = formatTable(plan.targets, [
      { header: 'target', value: (t) => t.target },
      { header: 'priority', value: (t) => t.priority },
      { header: 'cadence_d', value: (t) => t.cadenceDays },
      { header: 'astrometry', value: (t) => t.epochs.astrometry, digits: 0 },
      { header: 'spectroscopy', value: (t) => t.epochs.spectroscopy, digits: 0 },
      { header: 'cadence_met', value: (t) => (t.cadenceMet ? 'yes' : 'no') },
      {
        header: 'passage',
        value: (t) => t.shrinkage?.passage?.slice(0, 10) ?? '—',
      },
      {
        header: 'sigma_passage_d',
        value: (t) =>
          t.shrinkage?.passage
            ? `${sigma(t.shrinkage.periapsisDays.before, 2)} → ` +
              `${sigma(t.shrinkage.periapsisDays.after, 2)}${t.shrinkage.nominalPrior ? ' (nominal prior)' : ''}`
            : '—',
      },
      {
        header: 'coverage',
        value: (t) =>
          t.passage
            ? `${pct(t.passage.coverage.before)} → ${pct(t.passage.coverage.after)} within ` +
              `${t.passage.coverage.withinDays} d`
            : '—',
      },
      {
        header: 'sigma_mass_pct',
        value: (t) =>
          t.shrinkage
            ? `${sigma(t.shrinkage.massFraction.before && t.shrinkage.massFraction.before * 100, 2)} → ` +
              `${sigma(t.shrinkage.massFraction.after && t.shrinkage.massFraction.after * 100, 2)}`
            : '—',
      },
    ]);
    const windows = plan.targets.flatMap((t) =>
      t.passage
        ? [
            `  ${t.target} passes periapsis ${t.passage.date.slice(0, 16).replace('T', ' ')} UTC; window ± ` +
              `${t.passage.windowSigma} σ ${t.passage.windowStart.slice(0, 10)} to ` +
              `${t.passage.windowEnd.slice(0, 10)}, ${t.passage.epochs} epochs in it\n`,
            ...t.passage.unused.map(
              (n) => `    unused: ${n.site} ${n.date} ${n.kind}: ${n.words}\n`,
            ),
          ]
        : [],
    );
    const backups = plan.targets.flatMap((t) =>
      t.backups && (t.backups.critical > 0 || t.passage)
        ? [`  ${t.target}: ${t.backups.words}\n`]
        : [],
    );
    const relativity = plan.targets.flatMap((t) =>
      t.relativity ? t.relativity.summary.map((line) => `  ${t.target}: ${line}\n`) : [],
    );
    const skipped = result.sites.flatMap((s) =>
      s.skipped.map((k) => `  ${s.name} ${k.date}: ${k.reason}\n`),
    );
    const around = result.sites.flatMap((s) =>
      s.plannedAround.map(
        (n) =>
          `  ${s.name} ${n.date}: ${n.kept.map((k) => `block ${k.id} (${k.reason})`).join(', ')}\n`,
      ),
    );
    const siteUse = plan.sites
      .map(
        (s) =>
          `${s.name}: ${s.nightsUsed} of ${s.nights} nights used, ${s.plannedHours.toFixed(1)} h planned`,
      )
      .join('; ');
    const weighing =
      result.weather === 'aware'
        ? 'weather-aware: each night weighed by its chance of being clear'
        : 'weather-blind: every night weighed as clear';
    const clear = (mean: number | null) => (mean === null ? '—' : `${(100 * mean).toFixed(0)} %`);
    const siteClear = result.sites
      .map(
        (s) =>
          `${s.name} clear with chance ${clear(s.clearChance.mean)} on average ` +
          `(${s.clearChance.nightsLogged} night reports and the prior)`,
      )
      .join('; ');
    return [
      `campaign ${id}, nights ${plan.startDate} to ${plan.endDate} (${result.nights}); ${siteUse}\n`,
      `${weighing}; ${siteClear}\n\n`,
      formatTable(plan.epochs, columns),
      '\n',
      targets,
      windows.length ? `\nperiapsis windows:\n${windows.join('')}` : '',
      backups.length
        ? `\nagainst the weather (critical epochs on likely-lost nights, backups):\n${backups.join('')}`
        : '',
      relativity.length ? `\nrelativity forecast after the plan:\n${relativity.join('')}` : '',
      plan.unmet.length
        ? `\ngoals not met:\n${plan.unmet.map((u) => `  ${u.target} ${u.kind} ${u.start} to ${u.end}: ${u.reason}\n`).join('')}`
        : '',
      skipped.length ? `\nnights left out:\n${skipped.join('')}` : '',
      around.length ? `\nnights planned around blocks that stay:\n${around.join('')}` : '',
      '\n',
      written,
      ...plan.cautions.map((c) => `note: ${c}\n`),
    ].join('');
  },
};
