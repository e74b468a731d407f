// Request and response contracts of spreadsheet imports (issue 13): upload, column mapping, the dry run's
// report, the commit's progress. The columns of a spreadsheet are the company's own; a mapping says which
// of their headers holds each of our fields.
import { z } from 'zod';

export const importKinds = ['welders', 'qualifications', 'continuity', 'welds'] as const;
export type ImportKind = (typeof importKinds)[number];
/** The kinds this version imports (production welds are not built yet). */
export const availableImportKinds = ['welders', 'qualifications', 'continuity'] as const satisfies readonly ImportKind[];

/** How the file writes dates that are not ISO (YYYY-MM-DD is always read as ISO): chosen, never guessed. */
export const importDateFormats = ['iso', 'us', 'day-first'] as const;
export type ImportDateFormat = (typeof importDateFormats)[number];
export const importDateFormatNames: Record<ImportDateFormat, string> = {
  iso: 'ISO (2026-03-31)',
  us: 'US month first (3/31/2026)',
  'day-first': 'Day first (31/03/2026 or 31.03.2026)',
};

export const importFieldSchema = z.object({
  key: z.string(),
  label: z.string(),
  required: z.boolean(),
  hint: z.string(),
});
export type ImportField = z.infer<typeof importFieldSchema>;

/** field key → the file's header holding it (absent or null: not in this file). */
export const importMappingSchema = z.record(z.string().max(60), z.string().max(200).nullable());
export type ImportMapping = z.infer<typeof importMappingSchema>;

export const importCheckInput = z.object({
  mapping: importMappingSchema,
  dateFormat: z.enum(importDateFormats, 'Choose how the file writes dates'),
});
export type ImportCheckInput = z.infer<typeof importCheckInput>;

export const importUploadFields = z.object({
  kind: z.enum(availableImportKinds, `Choose what the file holds: ${availableImportKinds.join(', ')}`),
});

export const importIssueSchema = z.object({
  /** The spreadsheet's own row number (the header is row 1). */
  row: z.number().int(),
  /** The file's header of the column, or null when the problem is the whole row. */
  column: z.string().nullable(),
  message: z.string(),
});
export type ImportIssue = z.infer<typeof importIssueSchema>;

export const importChangeSchema = z.object({
  row: z.number().int(),
  key: z.string(),
  before: z.record(z.string(), z.string()),
  after: z.record(z.string(), z.string()),
});

export const importReportSchema = z.object({
  rows: z.number().int(),
  new: z.number().int(),
  unchanged: z.number().int(),
  changed: z.number().int(),
  /** Rows with at least one problem; any at all and the import cannot be committed. */
  errors: z.number().int(),
  /** The first problems (up to 500), in row order. */
  issues: z.array(importIssueSchema),
  /** The first changed records with what would change (up to 200). */
  changes: z.array(importChangeSchema),
  notes: z.array(z.string()),
});
export type ImportReport = z.infer<typeof importReportSchema>;

export const importStatuses = ['uploaded', 'checked', 'running', 'committed', 'failed', 'cancelled'] as const;

export const importSchema = z.object({
  id: z.string(),
  kind: z.enum(importKinds),
  fileName: z.string(),
  fileType: z.enum(['csv', 'xlsx']),
  sizeBytes: z.number().int(),
  status: z.enum(importStatuses),
  headers: z.array(z.string()),
  fields: z.array(importFieldSchema),
  mapping: importMappingSchema,
  dateFormat: z.enum(importDateFormats).nullable(),
  report: importReportSchema.nullable(),
  progress: z.object({ phase: z.string(), done: z.number().int(), total: z.number().int() }),
  error: z.string().nullable(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
  createdBy: z.object({ id: z.string(), name: z.string() }),
});
export type Import = z.infer<typeof importSchema>;

export const importListSchema = z.object({ items: z.array(importSchema.omit({ report: true, fields: true, headers: true })) });

// ---- paper WPQ records whose stated ranges differ from the computed ones --------------------------------

export const paperSettlements = ['computed', 'narrowed'] as const;
export const paperSettlementNames: Record<(typeof paperSettlements)[number], string> = {
  computed: 'The computed ranges stand',
  narrowed: 'Narrowed to what both allow',
};

export const paperRecordListQuery = z.object({
  /** 'open' (the default): differences waiting to be settled; 'settled'; 'all'. */
  state: z.enum(['open', 'settled', 'all']).default('open'),
});

export const paperSettleInput = z.object({
  settlement: z.enum(paperSettlements, 'Choose how the difference is settled'),
  note: z.string().trim().min(1, 'Say why (it goes into the audit trail)').max(500, 'At most 500 characters'),
});
export type PaperSettleInput = z.infer<typeof paperSettleInput>;

export const paperRecordSchema = z.object({
  qualificationId: z.string(),
  number: z.string(),
  welder: z.object({ id: z.string(), stamp: z.string(), name: z.string() }),
  code: z.string(),
  process: z.string(),
  testedOn: z.string(),
  importId: z.string().nullable(),
  /** The row of the imported file. */
  line: z.number().int(),
  differences: z.array(z.object({ variable: z.string(), label: z.string(), computed: z.string(), stated: z.string() })),
  settlement: z.enum(paperSettlements).nullable(),
  settlementNote: z.string().nullable(),
  settledBy: z.string().nullable(),
  settledAt: z.string().nullable(),
});
export type PaperRecord = z.infer<typeof paperRecordSchema>;
export const paperRecordListSchema = z.object({ items: z.array(paperRecordSchema) });
