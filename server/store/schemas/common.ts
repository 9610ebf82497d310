/**
 * Shared pieces of the input schemas, and the bridge from a zod verdict to our InputError.
 * The same schemas check HTTP bodies, CLI input and CSV rows, and document the API.
 */
import { z } from 'zod';
import { InputError, type FieldProblem } from '../../science/errors.ts';
import {
  checkTimeZone,
  parseDeclination,
  parseLatitude,
  parseLongitude,
  parseRightAscension,
} from '../../science/sky/index.ts';
import {
  parseDurationMinutes,
  parseEpoch,
  jdToIso,
  type DurationRule,
} from '../../science/time/index.ts';
import './issue-words.ts';

export const id = z.number().int().positive();

/*
 * Control characters (U+0000–U+001F and U+007F) are refused in stored text: a NUL cuts the text
 * short in every reader and export, the others corrupt tables and terminals. Free text (notes,
 * reasons) keeps tab and line breaks; one-line text (names, labels) keeps none.
 */
// biome-ignore lint/suspicious/noControlCharactersInRegex: finding control characters is the point
const CONTROL_ONE_LINE = /[\u0000-\u001f\u007f]/;
// biome-ignore lint/suspicious/noControlCharactersInRegex: finding control characters is the point
const CONTROL_FREE_TEXT = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
const controlMessage = (where: string) =>
  `must not contain control characters (U+0000–U+001F, U+007F${where})`;

/** One line of text (a name, a label): no control characters at all. */
export const lineText = (max: number) =>
  z
    .string()
    .max(max)
    .refine((v) => !CONTROL_ONE_LINE.test(v), { message: controlMessage('') });
/** Free text (notes, reasons): tab, LF and CR allowed, no other control character. */
export const freeText = (max: number) =>
  z
    .string()
    .max(max)
    .refine((v) => !CONTROL_FREE_TEXT.test(v), {
      message: controlMessage('; tab and line breaks are allowed'),
    });

export const name = lineText(100).trim().min(1);
export const notes = freeText(20_000).default('');
const ruleText = (err: unknown) => (err instanceof InputError ? err.rule : String(err));

/** The rule of a science-layer check, as a zod issue (the field is named by zod's path). */
function ruleOf(check: (v: unknown) => unknown) {
  return (v: unknown, ctx: z.RefinementCtx) => {
    try {
      check(v);
    } catch (err) {
      ctx.addIssue({ code: 'custom', message: ruleText(err) });
    }
  };
}

/** A local calendar date, `YYYY-MM-DD`. */
export const localDate = z.iso.date().describe('local calendar date YYYY-MM-DD');
/** An instant given as ISO 8601 with a zone, JD, MJD, Julian or Besselian epoch; stored as ISO UTC. */
export const epoch = z
  .string()
  .describe('epoch: ISO 8601 with zone, "JD …", "MJD …", "J2027.35" or "B1934.008"')
  .superRefine(ruleOf((v) => parseEpoch(v, 'epoch')));
/** An ISO 8601 duration within a rule's bounds, read by the one duration parser. */
export const isoDuration = (rule: DurationRule, description: string) =>
  z
    .string()
    .describe(description)
    .superRefine(ruleOf((v) => parseDurationMinutes(v, 'duration', rule)));
/** An IANA zone; a misspelled one is refused with the nearest valid names. */
export const timeZone = z
  .string()
  .describe('IANA time zone, e.g. America/Santiago')
  .superRefine(ruleOf((v) => checkTimeZone(v)));

/**
 * A coordinate as astronomers type it, read into degrees by the one parser of its kind (README
 * "Input forms"): a JSON number is degrees; text may be sexagesimal, and RA text with `h` or
 * colons is hours.
 */
function angle(parse: (v: unknown, field: string) => number, description: string) {
  return z
    .union([z.number(), z.string()])
    .describe(description)
    .transform((v, ctx) => {
      try {
        return parse(v, 'value');
      } catch (err) {
        ctx.addIssue({ code: 'custom', message: ruleText(err) });
        return z.NEVER;
      }
    });
}
export const rightAscension = (description: string) => angle(parseRightAscension, description);
export const declination = (description: string) => angle(parseDeclination, description);
export const latitude = (description: string) => angle(parseLatitude, description);
export const longitude = (description: string) => angle(parseLongitude, description);

/** Normalise an epoch string to ISO 8601 UTC (ms) and its JD. */
export function normaliseEpoch(value: string, field: string): { iso: string; jd: number } {
  const jd = parseEpoch(value, field);
  return { iso: jdToIso(jd), jd };
}

export type RowProblem = FieldProblem;

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = input;
  for (const k of path)
    v = v !== null && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[k] : undefined;
  return v;
}

/** Every problem zod found, as field/value/rule. */
export function problemsOf(error: z.ZodError, input: unknown, prefix = ''): RowProblem[] {
  return error.issues.map((i) => ({
    field: [prefix, ...i.path.map(String)].filter(Boolean).join('.') || prefix || '(input)',
    value: valueAt(input, i.path),
    rule: i.message,
  }));
}

/** Parse with a schema; on failure throw InputError for the first problem (all of them in `problems`). */
export function parseInput<S extends z.ZodType>(
  schema: S,
  input: unknown,
  prefix = '',
): z.output<S> {
  const r = schema.safeParse(input);
  if (r.success) return r.data;
  const problems = problemsOf(r.error, input, prefix);
  const first = problems[0]!;
  throw new InputError(first.field, first.value, first.rule, problems);
}
