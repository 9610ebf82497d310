/**
 * A stored campaign's time request for a semester: its season plan over the semester's nights
 * (weather-aware by default), the weather allowance from each site's learned clear chance, and the
 * relativity forecast of each target from its stored measurements (and the blocks that stay) with
 * and without the plan's epochs.
 */
import { inArray } from 'drizzle-orm';
import { measurements } from '../../../db/schema.ts';
import { inProcess, type Runner } from '../../jobs/tasks.ts';
import { InputError } from '../../science/errors.ts';
import { DEFAULT_PRECISION, forecastDetection } from '../../science/plan/index.ts';
import { plannedMeasurement } from '../../science/plan/forecast.ts';
import { keptEpochsOf } from '../../science/plan/season-monte-carlo.ts';
import {
  timeRequest,
  type FactorResult,
  type SemesterInput,
  type TimeRequest,
} from '../../science/plan/time-request.ts';
import { parseEpoch } from '../../science/time/index.ts';
import type { DbOrTx } from '../database.ts';
import { toInput } from '../fits.ts';
import {
  DEFAULT_WEATHER,
  prepare,
  type SeasonPlanRequest,
  type WeatherChoice,
} from './season-plan.ts';

export interface TimeRequestInput {
  /** The semester's name, 1–40 characters. */
  name: string;
  startDate: string;
  endDate: string;
  weather?: SeasonPlanRequest['weather'];
}

export async function timeRequestView(
  db: DbOrTx,
  campaignId: number,
  input: TimeRequestInput,
  atJd: number,
  run: Runner = inProcess,
): Promise<TimeRequest & { campaignId: number; weather: WeatherChoice }> {
  if (typeof input.name !== 'string' || input.name.trim() === '' || input.name.length > 40)
    throw new InputError('name', input.name, 'must name the semester in 1 to 40 characters');
  const weather = input.weather ?? DEFAULT_WEATHER;
  const p = await prepare(
    db,
    campaignId,
    { startDate: input.startDate, endDate: input.endDate, weather },
    atJd,
    run,
  );
  const plan = p.preview.plan;
  const clear = Object.fromEntries(p.weatherSites.map((s) => [s.site.name, s.nightWeights ?? {}]));
  const ids = [...p.targetIdByName.values()];
  const rows = ids.length
    ? await db.select().from(measurements).where(inArray(measurements.targetId, ids))
    : [];
  const factors: Record<string, FactorResult[]> = {};
  for (const t of p.targets) {
    const orbit = t.target.orbit;
    if (!orbit || orbit.distancePc === null) continue;
    const id = p.targetIdByName.get(t.target.name);
    const epochs = plan.epochs
      .filter((e) => e.target === t.target.name)
      .map((e) => ({
        jd: (parseEpoch(e.block.start.utc) + parseEpoch(e.block.end.utc)) / 2,
        kind: e.kind,
        sigma: e.precision.sigma,
      }));
    // Blocks that stay on the semester's nights count with and without the request, as in the plan.
    const kept = keptEpochsOf(p.weatherSites, t, p.options.precision, () => 0).map((k) =>
      plannedMeasurement(k, DEFAULT_PRECISION),
    );
    const f = forecastDetection({
      orbit,
      measurements: [...rows.filter((m) => m.targetId === id).map(toInput), ...kept],
      plan: epochs,
      precision: DEFAULT_PRECISION,
    });
    factors[t.target.name] = f.factors.map((x) => ({
      name: x.name,
      without: x.sigmaNow,
      with: x.sigmaAfter,
    }));
  }
  const semester: SemesterInput = {
    name: input.name.trim(),
    startDate: input.startDate,
    endDate: input.endDate,
  };
  return { campaignId, weather, ...timeRequest(semester, plan, clear, factors) };
}
