/**
 * zod's verdicts in our words, for every schema of the server (one global error map): "must be
 * at most 1", not "Too big: expected number to be <=1". A schema's own message still wins.
 */
import { z } from 'zod';

const TYPE_WORDS: Record<string, string> = {
  number: 'a number',
  string: 'text',
  boolean: 'true or false',
  array: 'a list',
  object: 'an object',
  int: 'a whole number',
  date: 'a date',
};

const count = (origin: string, n: unknown) =>
  origin === 'string'
    ? `${n} character${n === 1 ? '' : 's'}`
    : origin === 'array' || origin === 'set'
      ? `${n} item${n === 1 ? '' : 's'}`
      : String(n);

/** The rule an issue states, in words. */
export function issueWords(iss: z.core.$ZodRawIssue): string | undefined {
  const i = iss as z.core.$ZodRawIssue & Record<string, unknown>;
  const origin = String(i.origin ?? 'number');
  switch (i.code) {
    case 'too_big':
      return i.inclusive === false && origin !== 'string' && origin !== 'array'
        ? `must be below ${String(i.maximum)}`
        : `must be at most ${count(origin, i.maximum)}`;
    case 'too_small':
      if (origin === 'string' && i.minimum === 1) return 'must not be empty';
      return i.inclusive === false && origin !== 'string' && origin !== 'array'
        ? `must be above ${String(i.minimum)}`
        : `must be at least ${count(origin, i.minimum)}`;
    case 'invalid_type':
      return i.input === undefined
        ? 'is required'
        : `must be ${TYPE_WORDS[String(i.expected)] ?? String(i.expected)}`;
    case 'invalid_value': {
      const values = (i.values as unknown[] | undefined) ?? [];
      return values.length === 1
        ? `must be ${JSON.stringify(values[0])}`
        : `must be one of ${values.map((v) => JSON.stringify(v)).join(', ')}`;
    }
    case 'unrecognized_keys': {
      const keys = (i.keys as string[] | undefined) ?? [];
      return `has ${keys.length === 1 ? 'a field' : 'fields'} this request does not take: ${keys.join(', ')}`;
    }
    case 'invalid_format':
      return i.format === 'date'
        ? 'must be a calendar date YYYY-MM-DD'
        : i.format === 'datetime'
          ? 'must be an ISO 8601 instant with its zone'
          : `must be in ${String(i.format)} form`;
    case 'not_multiple_of':
      return `must be a multiple of ${String(i.divisor)}`;
    case 'invalid_union':
      return 'matches none of the forms this field takes';
    default:
      return undefined;
  }
}

z.config({ customError: issueWords });
