/**
 * The server's refusals in the client's words: each problem as "field label: value rule", with
 * the request's field names (startUtc, targetId, outcomes.0.exposureMinutes) read as the labels
 * people see on screen. The one place that turns an error into lines of text.
 */
import { ApiError } from '../api/client.ts';
import { fieldWords, ruleWords } from './field-words.ts';

const valueText = (v: unknown) =>
  v === undefined || v === null ? '' : typeof v === 'string' ? `“${v}” ` : `${JSON.stringify(v)} `;

/** Every problem of an error as a line of text for the screen. */
export function problemLines(err: unknown): string[] {
  if (!(err instanceof ApiError)) return [err instanceof Error ? err.message : String(err)];
  // The error document's details (Schemas['ErrorDetails']), with a batch's problems typed.
  const d = (err.details ?? {}) as {
    issues?: { field: string; rule: string }[];
    field?: string;
    value?: unknown;
    rule?: string;
    problems?: { field: string; value?: unknown; rule: string }[];
  };
  if (d.problems?.length)
    return d.problems.map(
      (p) => `${fieldWords(p.field)}: ${valueText(p.value)}${ruleWords(p.rule)}`,
    );
  if (d.issues?.length) return d.issues.map((i) => `${fieldWords(i.field)}: ${ruleWords(i.rule)}`);
  if (typeof d.field === 'string')
    return [`${fieldWords(d.field)}: ${valueText(d.value)}${ruleWords(String(d.rule ?? ''))}`];
  return [ruleWords(err.message)];
}
