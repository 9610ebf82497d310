/**
 * A campaign's candidate blocks for one night, from the same per-target settings as the season
 * plan (season-types.ts): each target's block length, priority and laser guide star use per kind.
 * Inside a target's periapsis window (± k σ of the coming passage's date) its priority doubles
 * and it gets the repeated epochs the campaign asks for: one candidate per part of the night
 * ("every N hours", each held to its part by a timing window) or as many as the darkness could
 * hold ("fill"). Ids are "<target>:<kind>", with ":<n>" for repeats.
 */
import type { Limits } from '../sky/limits.ts';
import type { Site } from '../sky/site.ts';
import { jdToIso } from '../time/index.ts';
import type { CandidateInput } from './candidates.ts';
import { nightGrid } from './grid.ts';
import { informationModel, posteriorCovariance } from './information.ts';
import { passagesIn } from './passage.ts';
import { resolveTargets, type SeasonOptions, type SeasonTarget } from './season-types.ts';

const ID_UNSAFE = /[^\w.:@ -]/g;
const idOf = (s: string) => s.replace(ID_UNSAFE, '_').slice(0, 80);

/**
 * @param siteHasLaser the site has a laser guide star (a block uses it only where the settings say so)
 * @returns candidates in the night scheduler's shape
 */
export function nightCandidates(
  site: Site,
  limits: Limits,
  siteHasLaser: boolean,
  date: string,
  targets: readonly SeasonTarget[],
  options: SeasonOptions,
): CandidateInput[] {
  const resolved = resolveTargets(targets, options);
  const k = options.periapsisWindowSigma ?? 2;
  const sameMinutes = options.sameTargetMinutes ?? 3;
  const dark = nightGrid(site, limits, date, 5).dark;
  const dusk = dark[0]?.startJd,
    dawn = dark[dark.length - 1]?.endJd;
  return resolved.flatMap((t) => {
    const orbit = t.input.target.orbit;
    let inWindow = false;
    if (orbit && dusk !== undefined && dawn !== undefined) {
      const m = informationModel(orbit);
      inWindow = passagesIn(m, posteriorCovariance(m, null), dusk, dawn, k).length > 0;
    }
    return t.input.kinds.flatMap((kind) => {
      const base = {
        target: t.name,
        kind,
        durationMinutes: t.blockMinutes[kind],
        priority: Math.min(1000, t.priority * (inWindow ? 2 : 1)),
        laserGuideStar: siteHasLaser && t.laserGuideStar[kind],
      };
      const id = `${t.name}:${kind}`;
      if (!inWindow || t.repeat === 'single' || dusk === undefined || dawn === undefined)
        return [{ id: idOf(id), ...base }];
      if (t.repeat === 'fill') {
        const n = Math.max(
          1,
          Math.floor(((dawn - dusk) * 1440) / (base.durationMinutes + sameMinutes)),
        );
        return Array.from({ length: n }, (_, i) => ({ id: idOf(`${id}:${i + 1}`), ...base }));
      }
      const step = t.repeat.stepHours / 24;
      const out: CandidateInput[] = [];
      for (let a = dusk, i = 1; a < dawn - base.durationMinutes / 1440; a += step, i++)
        out.push({
          id: idOf(`${id}:${i}`),
          ...base,
          earliestStart: jdToIso(a),
          latestEnd: jdToIso(Math.min(dawn, a + step)),
        });
      return out;
    });
  });
}
