/**
 * Flags of a campaign, remembered until something they read changes. An answer is keyed on the
 * campaign, the moment it is for and the resolution limit, and on the store's write mark: the
 * last audit-trail row. Every repository write (campaigns and their members, sites, systems,
 * targets, orbit solutions, measurements, nights, blocks, reports) adds one in its own
 * transaction, from this process or any other writing the same file (the CLI), so a write moves the
 * mark and the next request computes afresh. A failed write adds none and changes nothing.
 */
import { max } from 'drizzle-orm';
import { auditTrail } from '../../../db/schema.ts';
import type { Runner } from '../../jobs/tasks.ts';
import type { DbOrTx } from '../database.ts';
import { campaignFlags } from './planning.ts';

type Options = Parameters<typeof campaignFlags>[2];
type Answer = Awaited<ReturnType<typeof campaignFlags>>;

/** Answers kept (oldest dropped first): a few campaigns × moments × resolutions. */
const CACHE_SIZE = 64;

/** The id of the latest audit-trail row (0 for an empty trail): moves with every committed write. */
export async function writeMark(db: DbOrTx): Promise<number> {
  const [row] = await db.select({ id: max(auditTrail.id) }).from(auditTrail);
  return row?.id ?? 0;
}

/**
 * `campaignFlags` with its answers kept per store. Requests that arrive while the same answer is
 * being computed share that computation; a failure is not kept.
 */
export function cachedCampaignFlags(db: DbOrTx) {
  const answers = new Map<string, Promise<Answer>>();
  return async (campaignId: number, options: Options, run?: Runner): Promise<Answer> => {
    const key = [campaignId, options.nowJd, options.resolutionMas ?? '', await writeMark(db)].join(
      ' ',
    );
    let answer = answers.get(key);
    if (answer) {
      answers.delete(key); // re-inserted below: the map's order is the order of last use
    } else {
      answer = campaignFlags(db, campaignId, options, run);
      answer.catch(() => answers.delete(key));
    }
    answers.set(key, answer);
    while (answers.size > CACHE_SIZE) answers.delete(answers.keys().next().value!);
    return answer;
  };
}
