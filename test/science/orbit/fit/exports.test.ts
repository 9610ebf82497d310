import { describe, expect, it } from 'vitest';
import * as fit from '../../../../server/science/orbit/fit/index.ts';

// The public surface of orbit fitting is pinned: a change here is a decision.
describe('public surface', () => {
  it('orbit fitting exports exactly these values', () => {
    expect(Object.keys(fit).sort()).toEqual(['FitRefusal', 'OUTLIER_SIGMA', 'fitOrbits']);
  });
});
