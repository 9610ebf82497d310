/** Options that the orbit commands share: the orbit, Monte Carlo, and how epochs are printed. */
import { InputError } from '../../science/errors.ts';
import { validateOrbit, type Orbit, type OrbitInput } from '../../science/orbit/index.ts';
import { formatEpoch, type EpochFormat } from '../../science/time/index.ts';
import { UsageError } from '../io.ts';
import { readJsonArg } from '../args.ts';

export const ORBIT_OPTION_HELP = `  --orbit <json|file>   the orbit: inline JSON or a JSON file, as in POST /api/ephemeris
                        ({ "elements": {...}, "distancePc"?, "systemicVelocityKmS"?, "relativity"?, "covariance"? })
  --mc <draws>          Monte Carlo percentiles from this many draws of the covariance
  --seed <integer>      seed for --mc (default 1)
  --time <form>         how epochs are printed: iso (default), jd, mjd, julian, besselian
  --json | --csv        JSON or CSV instead of an aligned table`;

export const orbitOptions = {
  orbit: { type: 'string' },
  mc: { type: 'string' },
  seed: { type: 'string' },
  time: { type: 'string' },
  json: { type: 'boolean' },
  csv: { type: 'boolean' },
} as const;

export function readOrbit(text: string | undefined): Orbit {
  const input = readJsonArg('orbit', text);
  try {
    return validateOrbit(input as OrbitInput, 'orbit');
  } catch (err) {
    if (err instanceof InputError) throw new UsageError(`--${err.message}`);
    throw err;
  }
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
