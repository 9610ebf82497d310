/**
 * The rules of a measurement row that need no database, shared by the one-row write path and the
 * bulk import: its column values from checked input, and what a referenced block must agree with.
 */
import { InputError } from '../../science/errors.ts';
import { normaliseEpoch } from '../schemas/common.ts';
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

/** The block a measurement points at, as far as its rules need it. */
export interface BlockRef {
  targetId: number;
}

/** A measurement on a block must be of the block's target. */
export function checkMeasurementBlock(next: Record<string, unknown>, block: BlockRef): void {
  if (block.targetId !== next.targetId)
    throw new InputError(
      'blockId',
      next.blockId,
      `observed target ${block.targetId}, not target ${String(next.targetId)}`,
    );
}
