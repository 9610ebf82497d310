/**
 * The rules of a measurement row that need no database, shared by the one-row write path and the
 * bulk import: its column values from checked input, and what a referenced block must agree with.
 */
import { describeKind, type BlockKind } from '../../../descriptors/measurement-kinds.ts';
import { InputError } from '../../science/errors.ts';
import { normaliseEpoch } from '../schemas/common.ts';
import { isoSecond } from './night-times.ts';
import { MeasurementFields, type MeasurementInput } from '../schemas/entities.ts';

const keys = Object.keys(MeasurementFields.shape);

/** Column values of a checked measurement (epoch stored as ISO 8601 UTC and JD). */
export function measurementRow(
  m: ReturnType<typeof MeasurementInput.parse>,
): Record<string, unknown> {
  const { iso, jd } = normaliseEpoch(m.epoch, 'epoch');
  const row: Record<string, unknown> = {};
  for (const k of keys) row[k] = (m as Record<string, unknown>)[k] ?? null;
  return { ...row, notes: m.notes, epoch: iso, epochJd: jd };
}

/** The block a measurement points at, as far as its rules need it (block-rules.ts builds it). */
export interface BlockRef {
  id: number;
  targetId: number;
  kind: BlockKind;
  /** "night 2027-06-10 at …", for messages. */
  night: string;
  /** The night's span and its sunrise (the night is over), Unix ms. */
  startMs: number;
  endMs: number;
  overMs: number;
}

/** No measurement from the future: its epoch at or before the server's clock (`now`, Unix ms). */
export function checkMeasurementTime(next: Record<string, unknown>, now: number): void {
  if (Date.parse(next.epoch as string) > now)
    throw new InputError(
      'epoch',
      next.epoch,
      `is after the server's clock (${isoSecond(now)}): a measurement is recorded once it is made`,
    );
}

/**
 * A measurement on a block: of the block's target, of a kind its block obtains, at an epoch within
 * the block's night, and recorded once that night is over (`now`, Unix ms).
 */
export function checkMeasurementBlock(
  next: Record<string, unknown>,
  block: BlockRef,
  now: number,
): void {
  if (block.targetId !== next.targetId)
    throw new InputError(
      'blockId',
      next.blockId,
      `observed target ${block.targetId}, not target ${String(next.targetId)}`,
    );
  const kind = describeKind(next.kind as Parameters<typeof describeKind>[0]).blockKind;
  if (kind !== block.kind)
    throw new InputError(
      'kind',
      next.kind,
      `is obtained by ${kind} blocks; block ${block.id} is ${block.kind}`,
    );
  const at = Date.parse(next.epoch as string);
  if (at < block.startMs || at > block.endMs)
    throw new InputError(
      'epoch',
      next.epoch,
      `must lie within ${block.night} of block ${block.id} (${isoSecond(block.startMs)} to ${isoSecond(block.endMs)})`,
    );
  if (block.overMs > now)
    throw new InputError(
      'blockId',
      next.blockId,
      `is on ${block.night}, which is not over until sunrise (${isoSecond(block.overMs)}); record ` +
        `its measurements after that`,
    );
}
