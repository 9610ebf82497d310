/** Options that the orbit commands share: the orbit, Monte Carlo, and how epochs are printed. */
import { InputError } from '../../science/errors.ts';
import { validateOrbit, type Orbit, type OrbitInput } from '../../science/orbit/index.ts';
import { formatEpoch, type EpochFormat } from '../../science/time/index.ts';
import { UsageError } from '../io.ts';
import { positiveId, readJsonArg } from '../args.ts';
import { NotFoundError, type OrbitSolutionRow } from '../../store/index.ts';
import { STORE_HELP, storeAction, storeOptions, type StoreValues } from './store-option.ts';

export const ORBIT_OPTION_HELP = `  --orbit <json|file>   the orbit: inline JSON or a JSON file, as in POST /api/ephemeris
                        ({ "elements": {...}, "distancePc"?, "systemicVelocityKmS"?, "relativity"?, "covariance"? })
  --target-id <id>      instead, a stored target's current orbit solution (with its covariance)
  --mc <draws>          Monte Carlo percentiles from this many draws of the covariance
  --seed <integer>      seed for --mc (default 1)
  --time <form>         how epochs are printed: iso (default), jd, mjd, julian, besselian
  --json | --csv        JSON or CSV instead of an aligned table
${STORE_HELP} (with --target-id)`;

export const orbitOptions = {
  ...storeOptions,
  orbit: { type: 'string' },
  'target-id': { type: 'string' },
  mc: { type: 'string' },
  seed: { type: 'string' },
  time: { type: 'string' },
  json: { type: 'boolean' },
  csv: { type: 'boolean' },
} as const;

function readOrbit(text: string | undefined): Orbit {
  const input = readJsonArg('orbit', text);
  try {
    return validateOrbit(input as OrbitInput, 'orbit');
  } catch (err) {
    if (err instanceof InputError) throw new UsageError(`--${err.message}`);
    throw err;
  }
}

/** The orbit of --orbit, or of --target-id: the stored target's current solution, from either way in. */
export async function orbitOf(
  values: StoreValues & { orbit?: string | undefined; 'target-id'?: string | undefined },
): Promise<Orbit> {
  if (values['target-id'] === undefined) {
    if (values.database !== undefined || values.server !== undefined)
      throw new UsageError('--database and --server go with --target-id (a stored orbit)');
    return readOrbit(values.orbit);
  }
  if (values.orbit !== undefined) throw new UsageError('give --orbit or --target-id, not both');
  const id = positiveId('target-id', values['target-id']);
  const input = await storeAction(values, {
    local: async (store) => (await store.orbitSolutions.current(id)).solution.orbit,
    remote: async (api) => {
      await api({ method: 'GET', path: `/targets/${id}` }); // a missing target, named as such
      const page = await api<{ items: OrbitSolutionRow[] }>({
        method: 'GET',
        path: '/orbit-solutions',
        query: { targetId: id, current: true },
      });
      if (!page.items[0]) throw new NotFoundError('current orbit solution for target', id);
      return page.items[0].orbit;
    },
  });
  return validateOrbit(input as OrbitInput, 'orbit');
}

function integer(option: string, text: string): number {
  if (!/^-?\d+$/.test(text.trim()))
    throw new UsageError(`--${option}: ${JSON.stringify(text)} must be an integer`);
  return Number(text);
}

export function readMonteCarlo(values: {
  mc?: string;
  seed?: string;
}): { draws: number; seed: number } | undefined {
  if (values.mc === undefined) {
    if (values.seed !== undefined) throw new UsageError('--seed goes with --mc');
    return undefined;
  }
  return {
    draws: integer('mc', values.mc),
    seed: values.seed === undefined ? 1 : integer('seed', values.seed),
  };
}

const FORMATS: EpochFormat[] = ['iso', 'jd', 'mjd', 'julian', 'besselian'];

export function epochPrinter(value: string | undefined): (jd: number) => string {
  const format = (value ?? 'iso') as EpochFormat;
  if (!FORMATS.includes(format))
    throw new UsageError(`--time: ${JSON.stringify(value)} must be one of ${FORMATS.join(', ')}`);
  return (jd) => formatEpoch(jd, format);
}
