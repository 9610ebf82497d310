import { describe, expect, it } from 'vitest';
import { checkAcceptDigest } from '../../server/cli/args.ts';
import { UsageError } from '../../server/cli/io.ts';

describe('the preview/accept options of the planning commands', () => {
  it('take --digest only with --accept (constructed case)', () => {
    expect(() => checkAcceptDigest({ digest: 'abc' })).toThrow(UsageError);
    expect(() => checkAcceptDigest({ digest: 'abc' })).toThrow('--digest goes with --accept');
    expect(() => checkAcceptDigest({ digest: 'abc', accept: true })).not.toThrow();
    expect(() => checkAcceptDigest({ accept: true })).not.toThrow();
    expect(() => checkAcceptDigest({})).not.toThrow();
  });
});
