/**
 * A request that failed its schema: malformed (400) when any issue is a wrong shape (a missing
 * field, a wrong JSON type, an unknown key), a value error (422) when every issue is a value of the
 * right shape that breaks a rule (a range, a format, a choice, a refinement), as every other rule
 * the server keeps. ERROR_TABLE (errors.ts) maps it; validation.ts raises it.
 */
export interface RequestIssue {
  field: string;
  rule: string;
  code: string;
  /** The value as sent at that field (absent when it was missing). */
  value?: unknown;
}

/** zod's codes for a value of the right shape that breaks a rule; every other code is a shape error. */
const RULE_CODES = new Set([
  'too_big',
  'too_small',
  'not_multiple_of',
  'invalid_format',
  'invalid_value',
  'custom',
]);

/** A request that failed its schema: malformed (400) unless every issue is a broken rule (422). */
export class RequestInvalid extends Error {
  override readonly name = 'RequestInvalid';
  /** True when every issue is a value breaking a rule, none a wrong shape. */
  readonly breaksRule: boolean;
  constructor(
    readonly issues: RequestIssue[],
    /** Where the request failed: a bad path (`param`) is a malformed address, never a rule. */
    target?: string,
  ) {
    const first = issues[0]!;
    const more = issues.length > 1 ? ` (and ${issues.length - 1} more)` : '';
    super(`${first.field}: ${first.rule}${more}`);
    this.breaksRule = target !== 'param' && issues.every((i) => RULE_CODES.has(i.code));
  }
}
