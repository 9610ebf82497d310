/**
 * POST /campaigns/{id}/allocations/preview: the site-nights a pattern, a CSV file or a telescope's
 * iCalendar schedule would give the campaign, each new, already allocated or refused with its
 * reason (written nowhere); POST /campaigns/{id}/allocations: the same, stored in one
 * transaction, or nothing when any night is refused (lead: it shapes the campaign).
 */
import { z } from '@hono/zod-openapi';
import { MOST_NIGHTS_PER_REQUEST, type Store } from '../../store/index.ts';
import { previewAcceptRoutes } from './preview-accept.ts';
import { NightRowSchema } from './nights.ts';

const date = (d: string) => z.iso.date().openapi({ description: d });
const semester = z.string().max(40).optional().openapi({
  description: 'label given to every night (a semester, a run), at most 40 characters',
});
const text = z.string().min(1).max(2_000_000).openapi({ description: 'the file’s text, as read' });

export const AllocationBody = z
  .discriminatedUnion('source', [
    z
      .object({
        source: z.literal('pattern'),
        siteId: z.number().int().positive(),
        start: date('first night (evening’s local date), YYYY-MM-DD'),
        end: date('last night, included; within three years of start'),
        weekdays: z.array(z.number().int().min(1).max(7)).min(1).optional().openapi({
          description: 'ISO 8601 weekdays of the evening, 1 Monday … 7 Sunday; default every day',
        }),
        step: z
          .string()
          .optional()
          .openapi({
            description:
              'spacing of the nights from start, an ISO 8601 duration in whole days from P1D to P366D (P2D: every ' +
              'second night); default P1D',
          }),
        semester,
      })
      .strict(),
    z
      .object({
        source: z.literal('csv'),
        text: text.openapi({
          description:
            'CSV with a header row: site (a stored site’s name or id), date (YYYY-MM-DD, the ' +
            'evening’s local date), semester (optional)',
        }),
      })
      .strict(),
    z
      .object({
        source: z.literal('calendar'),
        siteId: z.number().int().positive(),
        text: text.openapi({
          description:
            'an iCalendar file (RFC 5545) of the telescope’s schedule; each event covers the ' +
            'nights of the local evenings it overlaps (an all-day event: its dates, DTEND ' +
            'excluded); recurring events are expanded to the campaign’s end',
        }),
        match: z.string().max(200).optional().openapi({
          description: 'keep only events whose summary or description contains this text',
        }),
        semester,
      })
      .strict(),
  ])
  .openapi('AllocationRequest', {
    description: `at most ${MOST_NIGHTS_PER_REQUEST} nights in one request`,
  });

const AllocationNightSchema = z
  .object({
    siteId: z.number().int(),
    site: z.string(),
    date: z.string().openapi({ description: 'the evening’s local date, YYYY-MM-DD' }),
    semester: z.string(),
    foundIn: z.string().openapi({ description: 'where in the request the night was found' }),
    state: z.enum(['new', 'allocated', 'refused']),
    reason: z.string().nullable(),
    nightId: z.number().int().nullable(),
  })
  .strict()
  .openapi('AllocationNight');

const PreviewSchema = z
  .object({
    campaignId: z.number().int(),
    nights: z.array(AllocationNightSchema),
    counts: z
      .object({ new: z.number().int(), allocated: z.number().int(), refused: z.number().int() })
      .strict(),
  })
  .strict()
  .openapi('AllocationPreview');

const StoredSchema = PreviewSchema.extend({ created: z.array(NightRowSchema) })
  .strict()
  .openapi('AllocationStored');

export function allocationRoutes(store: Store) {
  return previewAcceptRoutes({
    tag: 'campaigns',
    body: AllocationBody,
    preview: {
      path: '/campaigns/{id}/allocations/preview',
      summary: 'Preview allocated nights from a pattern, a CSV file or an iCalendar schedule',
      role: 'viewer',
      response: PreviewSchema,
      answers: 'each night: new, already allocated, or refused and why',
      run: (id, request) => store.allocations.preview(id, request),
    },
    accept: {
      path: '/campaigns/{id}/allocations',
      summary: 'Store allocated nights, all or none (422 naming each refused night)',
      role: 'lead',
      response: StoredSchema,
      answers: 'the nights stored',
      run: (actor, id, request) => store.allocations.accept(actor, id, request),
    },
  });
}
