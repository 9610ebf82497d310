/**
 * A fit that cannot be made says so, and says what is missing, instead of returning a number.
 * It is a ComputationError: the HTTP layer answers 422 `fit_refused` and the CLI exits non-zero.
 */
import { ComputationError } from '../../errors.ts';

export type RefusalReason =
  | 'too-few-measurements'
  | 'single-phase'
  | 'no-astrometry'
  | 'singular'
  | 'no-start';

export class FitRefusal extends ComputationError {
  constructor(
    readonly reason: RefusalReason,
    message: string,
    /** The parameters (or the star) the data leave undetermined. */
    readonly parameters: string[] = [],
  ) {
    super(message);
  }
}
