/** `epochwright forecast`: when a stored target's redshift and precession become detectable. */
import { momentJd } from '../../clock.ts';
import type { FactorForecast } from '../../science/plan/index.ts';
import type { Command } from '../io.ts';
import { commandArgs, optionalPositive, positiveId } from '../args.ts';
import { render, type Column } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';

const help = `usage: epochwright forecast --target-id <id> [--at <epoch>] [--astrometry-mas <σ>] [--spectroscopy-kms <σ>] [--json | --csv]

The detection forecast of a stored target's relativistic terms: the Fisher 1σ of the redshift
factor (gravitational redshift with transverse Doppler) and of the precession factor, from its
measurements now and with its blocks still planned after --at; the planned epoch after which each
reaches 3σ and 5σ if general relativity holds; the epochs that add most. Linear, at the current
orbit solution (which needs a distance).

options:
  --target-id <id>          the target
  --at <epoch>              count planned blocks from here (ISO 8601, JD, MJD); default now
  --astrometry-mas <σ>      1σ per offset component of a planned epoch (default: the median of the
                            target's offsets, else 1 mas)
  --spectroscopy-kms <σ>    1σ of a planned velocity (default: the median of its velocities, else 5 km/s)
${STORE_HELP}
  --json | --csv            machine-readable output instead of a table
`;

const day = (iso: string | null) => (iso === null ? null : iso.slice(0, 10));

export const forecastCommand: Command = {
  summary: 'when the redshift and precession of a stored target become detectable',
  help,
  async run(argv) {
    const { values, format } = commandArgs(argv, {
      ...storeOptions,
      'target-id': { type: 'string' },
      at: { type: 'string' },
      'astrometry-mas': { type: 'string' },
      'spectroscopy-kms': { type: 'string' },
    });
    const id = positiveId('target-id', values['target-id']);
    const atJd = momentJd(values.at, '--at');
    const ast = optionalPositive('astrometry-mas', values['astrometry-mas']);
    const rv = optionalPositive('spectroscopy-kms', values['spectroscopy-kms']);
    const precision = {
      ...(ast !== undefined ? { astrometryMas: ast } : {}),
      ...(rv !== undefined ? { spectroscopyKmS: rv } : {}),
    };
    const result = await storeAction(values, {
      local: (store) => store.plans.forecast(id, { atJd, precision }),
      remote: {
        method: 'GET',
        path: `/targets/${id}/forecast`,
        query: { at: values.at, ...precision },
      },
    });
    const sig = (x: number | null) => (x === null ? null : Number(x.toPrecision(3)));
    const columns: Column<FactorForecast>[] = [
      { header: 'factor', value: (f) => f.name },
      { header: 'sigma_now', value: (f) => sig(f.sigmaNow) },
      { header: 'sigma_after', value: (f) => sig(f.sigmaAfter) },
      { header: 'signif_now', value: (f) => f.significanceNow, digits: 1 },
      { header: 'signif_after', value: (f) => f.significanceAfter, digits: 1 },
      {
        header: '3sigma_after',
        value: (f) => (f.reaches[0]!.already ? 'already' : day(f.reaches[0]!.epoch)),
      },
      {
        header: '5sigma_after',
        value: (f) => (f.reaches[1]!.already ? 'already' : day(f.reaches[1]!.epoch)),
      },
      { header: 'best_epoch', value: (f) => day(f.topEpochs[0]?.epoch ?? null) },
    ];
    const table = render(format, result.factors, columns, result);
    if (format !== 'table') return table;
    return [
      `solution ${result.solution.id} (version ${result.solution.version}); ` +
        `${result.plannedEpochs} planned epochs after ${result.at}`,
      `precision: ${result.precision.text}`,
      `  (${result.precision.source})`,
      ...result.summary,
      '',
      table,
      `${result.assumptions}; epochs are observed times (light-time included when the Rømer delay is on)`,
      '',
    ].join('\n');
  },
};
