/** `epochwright ephemeris`: predicted positions and radial velocities at epochs. */
import { parseArgs } from 'node:util';
import { ephemeris, type EphemerisRow } from '../../science/orbit/index.ts';
import { describeOrbit } from '../../science/orbit/index.ts';
import { resolveEpochs, type EpochsInput } from '../../science/time/index.ts';
import { UsageError, type Command } from '../io.ts';
import { outputFormat } from '../args.ts';
import { render, type Column } from '../output.ts';
import {
  ORBIT_OPTION_HELP,
  epochPrinter,
  orbitOptions,
  readMonteCarlo,
  orbitOf,
} from './orbit-args.ts';

const help = `usage: epochwright ephemeris --orbit <json|file> | --target-id <id> (--start <epoch> --end <epoch> --step <duration> | --at <epoch>[,<epoch>…]) [options]

Predicts, for each epoch: separation ρ (mas), position angle θ (deg, north through east), offsets
Δα* (east) and Δδ (north) in mas, and with a distance the radial velocity (km/s, receding positive).
A binary of comparable masses (the orbit has "massRatio" q = M₂/M₁) adds each body's velocity about
the barycentre (rv1 primary, rv2 secondary; Newtonian); with "lightFraction" β as well, the
photocentre's offsets from the barycentre (photo_dra, photo_ddec, mas).
With a covariance, each comes with its 1σ; with --mc, with Monte Carlo percentiles (JSON/CSV).

Epochs: ISO 8601 with zone (2027-03-01T00:00Z, 2027-03-01), "JD 2461466.5", "MJD 61466",
"J2027.35", "B1934.008". Steps: ISO 8601 durations (P30D, PT6H, PT15M, P1DT12H).

options:
  --start, --end, --step a range of epochs (both ends included when on the step)
  --at                   a comma-separated list of epochs
${ORBIT_OPTION_HELP}
`;

export const ephemerisCommand: Command = {
  summary: 'predict sky offsets, separation, position angle and radial velocity at epochs',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...orbitOptions,
        start: { type: 'string' },
        end: { type: 'string' },
        step: { type: 'string' },
        at: { type: 'string' },
      },
      strict: true,
      allowPositionals: false,
    });
    const format = outputFormat(values);
    const orbit = await orbitOf(values);
    let epochs: EpochsInput;
    if (values.at !== undefined) {
      if (values.start ?? values.end ?? values.step)
        throw new UsageError('give either --at or --start/--end/--step');
      epochs = values.at.split(',').map((s) => s.trim());
    } else {
      if (values.start === undefined || values.end === undefined || values.step === undefined) {
        throw new UsageError('give --at <epochs>, or all of --start, --end and --step');
      }
      epochs = { start: values.start, end: values.end, step: values.step };
    }
    const mc = readMonteCarlo(values);
    const rows = ephemeris(orbit, resolveEpochs(epochs), mc ? { monteCarlo: mc } : {});
    const show = epochPrinter(values.time);
    const columns: Column<EphemerisRow>[] = [
      { header: 'epoch', value: (r) => show(r.jd) },
      { header: 'rho_mas', value: (r) => r.separationMas, digits: 3 },
      { header: 'theta_deg', value: (r) => r.positionAngleDeg, digits: 3 },
      { header: 'dra_mas', value: (r) => r.dRaMas, digits: 3 },
      { header: 'ddec_mas', value: (r) => r.dDecMas, digits: 3 },
    ];
    const sig = (f: keyof NonNullable<EphemerisRow['sigma']>) => (r: EphemerisRow) => r.sigma?.[f];
    if (orbit.covariance) {
      columns.push(
        { header: 'rho_sigma_mas', value: sig('separationMas'), digits: 3 },
        { header: 'theta_sigma_deg', value: sig('positionAngleDeg'), digits: 3 },
      );
    }
    if (orbit.distancePc !== null) {
      columns.push({ header: 'rv_kms', value: (r) => r.radialVelocityKmS, digits: 2 });
      if (orbit.covariance)
        columns.push({ header: 'rv_sigma_kms', value: sig('radialVelocityKmS'), digits: 2 });
      if (orbit.massRatio !== null)
        for (const [n, f] of [
          ['rv1', 'primaryRadialVelocityKmS'],
          ['rv2', 'secondaryRadialVelocityKmS'],
        ] as const) {
          columns.push({ header: `${n}_kms`, value: (r) => r[f], digits: 2 });
          if (orbit.covariance)
            columns.push({ header: `${n}_sigma_kms`, value: sig(f), digits: 2 });
        }
      columns.push({ header: 'r3d_au', value: (r) => r.separation3dAu, digits: 2 });
    }
    if (orbit.massRatio !== null && orbit.lightFraction !== null) {
      columns.push(
        { header: 'photo_dra_mas', value: (r) => r.photocentreDRaMas, digits: 3 },
        { header: 'photo_ddec_mas', value: (r) => r.photocentreDDecMas, digits: 3 },
      );
    }
    columns.push({ header: 'nu_deg', value: (r) => r.trueAnomalyDeg, digits: 3 });
    if (mc && format === 'csv') {
      for (const [k, p] of ['p2.5', 'p16', 'p50', 'p84', 'p97.5'].entries()) {
        columns.push({
          header: `rho_${p}_mas`,
          value: (r) => r.percentiles?.separationMas?.[k],
          digits: 3,
        });
        columns.push({
          header: `theta_${p}_deg`,
          value: (r) => r.percentiles?.positionAngleDeg?.[k],
          digits: 3,
        });
      }
    }
    return render(format, rows, columns, { orbit: describeOrbit(orbit), predictions: rows });
  },
};
