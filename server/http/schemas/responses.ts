/**
 * The pieces every route's `responses` is made of: a JSON body with its schema, and the one error
 * body (`{ error: { code, message, details } }`) under each status a route can answer.
 */
import { z } from '@hono/zod-openapi';

export const json = <S extends z.ZodType>(schema: S, description: string) => ({
  content: { 'application/json': { schema } },
  description,
});

export const ErrorSchema = z
  .object({
    error: z
      .object({
        code: z.string().openapi({ description: 'stable, machine-readable' }),
        message: z.string(),
        details: z.unknown().optional().openapi({
          description:
            '400: issues (field, rule, code); 422: field, value, rule; 409: the current state',
        }),
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
};

/** The errors of a route that reads no store and needs no token. */
export const computeErrorResponses = {
  400: errorResponses[400],
  422: errorResponses[422],
};
