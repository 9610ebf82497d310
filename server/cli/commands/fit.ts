/** `epochwright fit`: orbits from measurements in a CSV file or in the store; optionally accepted as new solutions. */
import { parseArgs } from 'node:util';
import { RESIDUAL_PAGE } from '../../science/orbit/fit/residual-page.ts';
import {
  fitOrbits,
  type FitRequest,
  type FitResult,
  type StarHints,
} from '../../science/orbit/fit/index.ts';
import type { OrbitSolutionRow, StoredFitOptions } from '../../store/index.ts';
import { UsageError, type Command } from '../io.ts';
import { optionalId, outputFormat, positiveId } from '../args.ts';
import { readStarsFile } from './fit-csv.ts';
import { renderFit } from './fit-output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';

const help = `usage: epochwright fit --file <measurements.csv> [--target <name>]... [model options] [--json | --csv]
       epochwright fit --target-id <id> | --system-id <id> [--target-id <id>]... [--accept [--notes <text>]] [model options]

Fits orbits by least squares from a global search over period, eccentricity and periapsis time, so no
starting orbit is needed. Several targets are fitted jointly: they share the primary's mass, distance,
velocity and (with --frame) its offset and drift.

source:
  --file <path>           measurements CSV in the layout of 'epochwright export measurements'
                          (target, kind, epoch, dRaMas, dDecMas, sigmaDRaMas, …, radialVelocityKmS, …)
  --target <name>         fit only this target of the file (repeatable)
  --target-id <id>        the stored measurements of one target (with --system-id: only these targets, repeatable)
  --system-id <id>        the stored measurements of a system's targets, jointly
  --accept                store the fit as new current orbit-solution versions (the old ones stay)
  --notes <text>          notes stored with accepted solutions
${STORE_HELP}
model:
  --period <min:max>      period search range in years, for every star, or <target>=<min:max> (repeatable)
  --eccentricity <min:max> eccentricity search range (default 0:0.97)
  --fix <name=value>      hold a parameter, e.g. --fix distancePc=15000 or --fix "Ilex.eccentricity=0" (repeatable)
  --prior <name=mean,σ>   Gaussian prior, e.g. --prior distancePc=15000,500 (repeatable)
  --frame <what>          also fit the primary's offset and/or drift: offset, drift or offset,drift
  --relativity <terms>    romer,gravitationalRedshift,transverseDoppler,precession, all, or none
                          (default: a file is fitted Newtonian; a stored target keeps its solution's terms)
  --free-factors <names>  fit redshiftFactor and/or precessionFactor (0 Newtonian, 1 general relativity),
                          comma-separated; each switches its terms on
  --robust                Huber loss: residuals beyond 2σ weigh less
  --as-of <epoch>         count the next periapsis from here (default: the latest epoch)
  --posterior <seed[:rounds]>
                          posterior percentiles from an affine-invariant ensemble (seeded)
output:
  --json | --csv          JSON (everything) or CSV (the quantities; with --residuals the residuals)
  --residuals             CSV of residuals per measurement
`;

function range(option: string, text: string): { min: number; max: number } {
  const m = /^\s*([^:]+):([^:]+)\s*$/.exec(text);
  const min = Number(m?.[1]),
    max = Number(m?.[2]);
  if (!m || !Number.isFinite(min) || !Number.isFinite(max))
    throw new UsageError(`--${option}: ${JSON.stringify(text)} must be <min>:<max>`);
  return { min, max };
}

function pairs(option: string, list: string[] | undefined): [string, string][] {
  return (list ?? []).map((t) => {
    const k = t.lastIndexOf('=');
    if (k <= 0) throw new UsageError(`--${option}: ${JSON.stringify(t)} must be <name>=<value>`);
    return [t.slice(0, k).trim(), t.slice(k + 1).trim()];
  });
}

function numberOf(option: string, name: string, text: string): number {
  const x = Number(text);
  if (text === '' || !Number.isFinite(x))
    throw new UsageError(`--${option}: ${name}=${JSON.stringify(text)} must be a number`);
  return x;
}

const SWITCHES = ['romer', 'gravitationalRedshift', 'transverseDoppler', 'precession'];

/** The model options shared by file and stored fits. */
function modelOptions(
  v: Record<string, unknown>,
): Omit<FitRequest, 'stars'> & { hintsAll?: StarHints; hintsBy: Record<string, StarHints> } {
  const hintsBy: Record<string, StarHints> = {};
  let hintsAll: StarHints | undefined;
  const ecc =
    v.eccentricity === undefined ? undefined : range('eccentricity', v.eccentricity as string);
  for (const p of (v.period as string[] | undefined) ?? []) {
    const k = p.lastIndexOf('=');
    if (k > 0)
      hintsBy[p.slice(0, k).trim()] = {
        periodYears: range('period', p.slice(k + 1)),
        ...(ecc ? { eccentricity: ecc } : {}),
      };
    else hintsAll = { periodYears: range('period', p) };
  }
  if (ecc) hintsAll = { ...hintsAll, eccentricity: ecc };
  const fixed = Object.fromEntries(
    pairs('fix', v.fix as string[]).map(([n, x]) => [n, numberOf('fix', n, x)]),
  );
  const priors = Object.fromEntries(
    pairs('prior', v.prior as string[]).map(([n, x]) => {
      const [mean, sigma] = x.split(',');
      return [
        n,
        { mean: numberOf('prior', n, mean ?? ''), sigma: numberOf('prior', n, sigma ?? '') },
      ];
    }),
  );
  const out: ReturnType<typeof modelOptions> = {
    fixed,
    priors,
    hintsBy,
    ...(hintsAll ? { hintsAll } : {}),
  };
  if (v.frame !== undefined) {
    const parts = (v.frame as string).split(',').map((s) => s.trim());
    for (const p of parts)
      if (p !== 'offset' && p !== 'drift')
        throw new UsageError(`--frame: ${JSON.stringify(p)} must be offset or drift`);
    out.frame = { offset: parts.includes('offset'), drift: parts.includes('drift') };
  }
  if (v.relativity !== undefined) {
    const t = (v.relativity as string).trim();
    const on = t === 'all' ? SWITCHES : t === 'none' ? [] : t.split(',').map((s) => s.trim());
    for (const s of on)
      if (!SWITCHES.includes(s))
        throw new UsageError(
          `--relativity: ${JSON.stringify(s)} is not one of ${SWITCHES.join(', ')}, all, none`,
        );
    out.relativity = Object.fromEntries(SWITCHES.map((s) => [s, on.includes(s)]));
  }
  if (v['free-factors'] !== undefined) {
    const names = (v['free-factors'] as string).split(',').map((s) => s.trim());
    for (const n of names)
      if (n !== 'redshiftFactor' && n !== 'precessionFactor')
        throw new UsageError(
          `--free-factors: ${JSON.stringify(n)} is not one of redshiftFactor, precessionFactor`,
        );
    out.freeFactors = names as ('redshiftFactor' | 'precessionFactor')[];
  }
  if (v.robust) out.loss = 'huber';
  if (v['as-of'] !== undefined) out.asOf = v['as-of'] as string;
  if (v.posterior !== undefined) {
    const m = /^(-?\d+)(?::(\d+))?$/.exec((v.posterior as string).trim());
    if (!m)
      throw new UsageError(
        `--posterior: ${JSON.stringify(v.posterior)} must be <seed> or <seed>:<rounds>`,
      );
    out.posterior = { seed: Number(m[1]), ...(m[2] ? { rounds: Number(m[2]) } : {}) };
  }
  return out;
}

export const fitCommand: Command = {
  summary:
    'fit orbits to measurements (CSV file or stored), optionally accepting them as new solutions',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...storeOptions,
        file: { type: 'string' },
        target: { type: 'string', multiple: true },
        'target-id': { type: 'string', multiple: true },
        'system-id': { type: 'string' },
        accept: { type: 'boolean' },
        notes: { type: 'string' },
        period: { type: 'string', multiple: true },
        eccentricity: { type: 'string' },
        fix: { type: 'string', multiple: true },
        prior: { type: 'string', multiple: true },
        frame: { type: 'string' },
        relativity: { type: 'string' },
        'free-factors': { type: 'string' },
        robust: { type: 'boolean' },
        'as-of': { type: 'string' },
        posterior: { type: 'string' },
        json: { type: 'boolean' },
        csv: { type: 'boolean' },
        residuals: { type: 'boolean' },
      },
      strict: true,
      allowPositionals: false,
    });
    const format = outputFormat(values);
    if (values.residuals && format !== 'csv')
      throw new UsageError(
        '--residuals goes with --csv (the table and JSON always include residuals)',
      );
    const targetIds = (values['target-id'] ?? []).map((t) => positiveId('target-id', t));
    const systemId = optionalId('system-id', values['system-id']);
    if (
      [values.file !== undefined, targetIds.length > 0 || systemId !== undefined].filter(Boolean)
        .length !== 1
    )
      throw new UsageError('give --file, or --target-id / --system-id for stored measurements');
    if (systemId === undefined && targetIds.length > 1)
      throw new UsageError(
        'several --target-id go with --system-id (a joint fit shares one primary)',
      );
    if (values.accept && values.file !== undefined)
      throw new UsageError(
        '--accept stores solutions of stored targets: use it with --target-id or --system-id',
      );
    const { hintsAll, hintsBy, ...model } = modelOptions(values);
    if (values.file !== undefined) {
      const stars = readStarsFile(values.file, values.target ?? []).map((s) => {
        const h = hintsBy[s.name] ?? hintsAll;
        return h ? { ...s, hints: h } : s;
      });
      return renderFit(fitOrbits({ ...model, stars }), format, values.residuals === true);
    }
    const named = (names: string[]) =>
      Object.fromEntries(
        names.flatMap((n) => ((hintsBy[n] ?? hintsAll) ? [[n, hintsBy[n] ?? hintsAll!]] : [])),
      );
    const hinted = hintsAll !== undefined || Object.keys(hintsBy).length > 0;
    const { result, solutions } = await storeAction<{
      result: FitResult;
      solutions: OrbitSolutionRow[];
    }>(values, {
      local: async (store, actor) => {
        const ids =
          systemId === undefined
            ? targetIds
            : await store.fits.systemTargetIds(
                systemId,
                targetIds.length > 0 ? targetIds : undefined,
              );
        let prepared = await store.fits.prepare(ids, model);
        if (hinted) {
          // Named hints first, then the one for every star, then the default from the current solution.
          const first = prepared;
          const hints = Object.fromEntries(
            first.targets.map((t) => [
              t.name,
              hintsBy[t.name] ??
                hintsAll ??
                first.request.stars.find((s) => s.name === t.name)?.hints ??
                {},
            ]),
          );
          prepared = await store.fits.prepare(ids, {
            ...model,
            hints,
          } satisfies StoredFitOptions);
        }
        const result = fitOrbits(prepared.request);
        const solutions = values.accept
          ? await store.fits.accept(actor, prepared, result, values.notes ?? '')
          : [];
        return { result, solutions };
      },
      remote: async (api) => {
        // The hint for every star needs the stars' names: the targets' (the server keys hints by name).
        let hints: Record<string, StarHints> | undefined;
        if (hinted) {
          const names =
            systemId === undefined
              ? [
                  (await api<{ name: string }>({ method: 'GET', path: `/targets/${targetIds[0]}` }))
                    .name,
                ]
              : (
                  await api<{ items: { name: string }[] }>({
                    method: 'GET',
                    path: '/targets',
                    query: { systemId, limit: 500 },
                  })
                ).items.map((t) => t.name);
          hints = named(names);
        }
        const answer = await api<{
          result: FitResult & { residualPage?: unknown; residualSummary?: unknown };
          solutions?: OrbitSolutionRow[];
        }>({
          method: 'POST',
          path: `${systemId === undefined ? `/targets/${targetIds[0]}` : `/systems/${systemId}`}/fit${values.accept ? '/accept' : ''}`,
          body: {
            ...model,
            ...(hints ? { hints } : {}),
            ...(systemId !== undefined && targetIds.length > 0 ? { targetIds } : {}),
            ...(values.accept && values.notes !== undefined ? { notes: values.notes } : {}),
            residualPage: { limit: RESIDUAL_PAGE.maxLimit },
          },
        });
        // Every residual, as a fit in the process gives them (the page is the whole of them).
        const { residualPage: _page, residualSummary: _summary, ...result } = answer.result;
        return { result, solutions: answer.solutions ?? [] };
      },
      writes: values.accept === true,
    });
    if (values.accept && format === 'json')
      return `${JSON.stringify({ solutions, result }, null, 2)}\n`;
    const note = solutions
      .map(
        (r, k) =>
          `stored ${result.stars[k]!.name} (target ${r.targetId}) as orbit solution ${r.id}, version ` +
          `${r.version}, now current\n`,
      )
      .join('');
    return renderFit(result, format, values.residuals === true, note);
  },
};
