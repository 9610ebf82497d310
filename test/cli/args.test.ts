import { describe, expect, it, vi } from 'vitest';
import { checkAcceptDigest, retiredIdOption } from '../../server/cli/args.ts';
import { main } from '../../server/cli/main.ts';
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

describe('one spelling for each id option', () => {
  // constructed case: each command that names a stored record by id, with the spelling used before
  const cases: [string[], string][] = [
    [['flags', '--campaign', '1'], '--campaign is now --campaign-id'],
    [['plan-season', '--campaign', '1'], '--campaign is now --campaign-id'],
    [['time-request', '--campaign', '1'], '--campaign is now --campaign-id'],
    [['plan-season', '--campaign-id', '1', '--site', '2'], '--site is now --site-id'],
    [['site-statistics', '--site', '1'], '--site is now --site-id'],
    [['site-precision', '--site', '1'], '--site is now --site-id'],
    [['plan-night', '--night', '1'], '--night is now --night-id'],
    [['replan', '--night', '1'], '--night is now --night-id'],
    [['account', 'revoke', '--id', '1'], '--id is now --token-id'],
  ];
  it.each(cases)('%j is refused, naming the new spelling', async (argv, words) => {
    let said = '';
    const spy = vi.spyOn(process.stderr, 'write').mockImplementation((chunk) => {
      said += String(chunk);
      return true;
    });
    try {
      expect(await main(argv)).toBe(2);
    } finally {
      spy.mockRestore();
    }
    expect(said).toContain(words);
  });

  it.each([
    [['ephemeris', '--from', '2027-01-01'], '--from is now --start'],
    [['system', 'add', '--from', '{}'], '--from is now --start (the first of a range) or --record'],
    [['events', '--to', '2027-01-01'], '--to is now --end'],
    [['backup', '--to', 'copy.db'], '--to is now --end (the last of a range) or --file'],
    [['ephemeris', '--every', '30d'], '--every is now --step, an ISO 8601 duration'],
    [['allocate', '--campaign-id', '1', '--every-nights', '2'], '--every-nights is now --step'],
  ])(
    '%j: a range or step option of earlier versions is refused, naming its successor',
    async (argv, words) => {
      let said = '';
      const spy = vi.spyOn(process.stderr, 'write').mockImplementation((chunk) => {
        said += String(chunk);
        return true;
      });
      try {
        expect(await main(argv)).toBe(2);
      } finally {
        spy.mockRestore();
      }
      expect(said).toContain(words);
    },
  );

  it('answers only for a retired spelling', () => {
    expect(retiredIdOption("Unknown option '--site'")).toMatch(/--site-id/);
    expect(retiredIdOption("Unknown option '--sight'")).toBeNull();
  });
});
