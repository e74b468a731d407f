// Request and response contracts of the continuity log (issue 5): the monthly grid of a shop, its save,
// the welders that can be added to it, the review queue of use logged while lapsed and a welder's
// continuity timeline. The API parses requests with these; the web parses responses and builds bodies.
import { z } from 'zod';
import { isIsoDate } from '../continuity/calendar.js';
import { processes } from './coupon.js';
import { searchQuerySchema, textSchema } from './common.js';

const uuid = z.string().uuid('Choose one from the list');
export const monthText = z
  .string()
  .regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'Write the month as YYYY-MM')
  .refine((m) => m >= '1900-01', 'Write the month as YYYY-MM');
const isoDate = z.string().refine(isIsoDate, 'Write the date as YYYY-MM-DD');
const processSchema = z.enum(processes, { error: `Choose one of ${processes.join(', ')}` });

export const gridQuery = z.object({ shopId: uuid, month: monthText });

const cellVersion = z.number().int('Not a valid version').min(1, 'Not a valid version').nullable().optional();

export const gridSaveInput = z.object({
  shopId: uuid,
  month: monthText,
  cells: z
    .array(
      z.object({
        welderId: uuid,
        process: processSchema,
        usedOn: isoDate,
        jobReference: textSchema({ max: 80 }).min(1, 'Enter the job or traveler number'),
        note: textSchema({ max: 500, multiline: true }).optional().default(''),
        /** The version of the cell the edit was made on; null (or absent) for a cell that was empty. */
        version: cellVersion,
      }),
    )
    .max(2000, 'At most 2000 cells in one save')
    .optional()
    .default([]),
  remove: z
    .array(z.object({ welderId: uuid, process: processSchema, version: cellVersion }))
    .max(2000, 'At most 2000 cells in one save')
    .optional()
    .default([]),
});
export type GridSaveInput = z.output<typeof gridSaveInput>;
export type GridSaveBody = z.input<typeof gridSaveInput>;

export const gridWeldersQuery = z.object({ shopId: uuid, q: searchQuerySchema });

/**
 * What the QA manager decided about the welds made while the welder was out of continuity (common
 * practice (no source): a nonconformance is closed with a disposition and its reasons).
 */
export const reviewDecisions = ['welds-examined', 'welds-repaired', 'logged-in-error'] as const;
export type ReviewDecision = (typeof reviewDecisions)[number];
export const reviewDecisionLabels: Record<ReviewDecision, string> = {
  'welds-examined': 'Welds examined and accepted',
  'welds-repaired': 'Welds cut out or repaired',
  'logged-in-error': 'Logged in error: the welder did not weld',
};
export const reviewInput = z.object({
  decision: z.enum(reviewDecisions, { error: 'Choose what was decided about the welds' }),
  note: textSchema({ max: 500, min: 1, multiline: true }),
});
export type ReviewInput = z.infer<typeof reviewInput>;

// ---- responses --------------------------------------------------------------------------------------

const shopRef = z.object({ id: z.string(), name: z.string(), code: z.string() });

export const gridCellSchema = z.object({
  entryId: z.string(),
  /** Who logged the cell last and when: named when another person's change wins over an edit. */
  loggedBy: z.string().nullable().optional(),
  updatedAt: z.string().optional(),
  usedOn: z.string(),
  jobReference: z.string(),
  note: z.string(),
  /** Use logged on a date when the welder's qualification for the process had already lapsed. */
  flaggedLapsed: z.boolean(),
  version: z.number().int(),
});
export type GridCell = z.infer<typeof gridCellSchema>;

/** The continuity of one (process, code) pair of a grid row: its lapse date and, when every qualification
 *  of the pair is revoked, the revocation date (already folded into lapsesOn). */
export const gridPairSchema = z.object({
  process: z.string(),
  code: z.string(),
  lapsesOn: z.string(),
  revokedOn: z.string().nullable(),
});
export type GridPair = z.infer<typeof gridPairSchema>;

export const gridRowSchema = z.object({
  welder: z.object({ id: z.string(), stamp: z.string(), name: z.string(), homeShopId: z.string() }),
  home: z.boolean(),
  qualifiedProcesses: z.array(z.string()),
  pairs: z.array(gridPairSchema).default([]),
  cells: z.record(z.string(), gridCellSchema.nullable()),
});
export type GridRow = z.infer<typeof gridRowSchema>;

export const gridSchema = z.object({
  shop: shopRef,
  month: z.string(),
  /** Older than the company's closed-month age: only the QA manager may change it. */
  closed: z.boolean(),
  /** The day the states are counted from (the company's today). */
  today: z.string().optional(),
  processes: z.array(z.string()),
  rows: z.array(gridRowSchema),
});
export type Grid = z.infer<typeof gridSchema>;

export const gridWelderSchema = z.object({
  id: z.string(),
  stamp: z.string(),
  name: z.string(),
  homeShop: shopRef.nullable(),
  qualifiedProcesses: z.array(z.string()),
});
export type GridWelder = z.infer<typeof gridWelderSchema>;
export const gridWelderListSchema = z.object({ items: z.array(gridWelderSchema) });

export const reviewEntrySchema = z.object({
  id: z.string(),
  welder: z.object({ id: z.string(), stamp: z.string(), name: z.string() }),
  shop: shopRef,
  process: z.string(),
  usedOn: z.string(),
  jobReference: z.string(),
  note: z.string(),
  reviewStatus: z.enum(['pending', 'reviewed']).nullable(),
  reviewNote: z.string().nullable(),
  reviewDecision: z.enum(reviewDecisions).nullable(),
  loggedBy: z.string().nullable(),
});
export type ReviewEntry = z.infer<typeof reviewEntrySchema>;
export const reviewQueueSchema = z.object({ items: z.array(reviewEntrySchema) });

export const timelineEventKinds = ['test', 'use', 'lapse', 'renewal', 'flag', 'revocation'] as const;
export const timelineSchema = z.object({
  processes: z.array(
    z.object({
      process: z.string(),
      code: z.string(),
      events: z.array(z.object({ date: z.string(), kind: z.enum(timelineEventKinds), detail: z.string() })),
      state: z.string(),
      lapsesOn: z.string().nullable(),
    }),
  ),
});
export type Timeline = z.infer<typeof timelineSchema>;
