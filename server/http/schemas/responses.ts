/**
 * The pieces every route's `responses` is made of: a JSON body with its schema, and the one error
 * body (`{ error: { code, message, details } }`) under each status a route can answer.
 */
import { z } from '@hono/zod-openapi';

export const json = <S extends z.ZodType>(schema: S, description: string) => ({
  content: { 'application/json': { schema } },
  description,
});

/** What an error names; codes add their own fields (a 409's current version, a refusal's reason). */
export const ErrorDetailsSchema = z
  .object({
    issues: z
      .array(
        z
          .object({
            field: z.string(),
            rule: z.string(),
            code: z.string(),
            value: z.unknown().optional(),
          })
          .strict(),
      )
      .optional()
      .openapi({
        description:
          'a request that failed its schema: one per field (dotted path), with the value sent; ' +
          '400 when any is a wrong shape, 422 when every one is a broken rule',
      }),
    field: z
      .string()
      .optional()
      .openapi({ description: '422: the dotted field that breaks a rule' }),
    value: z.unknown().optional().openapi({ description: '422: the value as sent (any JSON)' }),
    rule: z.string().optional().openapi({ description: '422: the rule, in words' }),
    problems: z
      .array(z.record(z.string(), z.unknown()))
      .optional()
      .openapi({ description: '422 on a batch: every row’s problem' }),
    accepted: z
      .array(z.string())
      .optional()
      .openapi({ description: '400 on an unknown query parameter: the ones the route takes' }),
    entity: z.string().optional().openapi({ description: '404: the kind of record' }),
    id: z.union([z.number(), z.string()]).optional().openapi({ description: '404: its id' }),
  })
  .catchall(z.unknown())
  .openapi('ErrorDetails');

export const ErrorSchema = z
  .object({
    error: z
      .object({
        code: z.string().openapi({ description: 'stable, machine-readable' }),
        message: z.string(),
        details: ErrorDetailsSchema.optional(),
      })
      .strict(),
  })
  .strict()
  .openapi('Error');

const err = (description: string) => json(ErrorSchema, description);
export const errorResponses = {
  400: err('malformed request (field-level issues in details)'),
  401: err('no valid bearer token'),
  403: err('the token’s role may not do this'),
  404: err('no such record'),
  409: err('clashes with the stored state (stale version, duplicate, still in use)'),
  422: err('a value breaks a rule (field, value, rule in details)'),
  503: err(
    'computations busy (code busy, with Retry-After) or stopped at the time limit (code ' +
      'time_limit, details.timeLimitS)',
  ),
};

/** The errors of a stateless computation (a token is needed when the server has a store). */
export const computeErrorResponses = {
  400: errorResponses[400],
  401: errorResponses[401],
  403: errorResponses[403],
  422: errorResponses[422],
  503: errorResponses[503],
};
