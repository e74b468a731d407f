// Request and response contracts of the company settings, the lapse-watch job (preview, runs, notices)
// and the Overview (issue 5). The API parses with these; the web resolves its forms and parses responses.
import { z } from 'zod';
import { codeIdSchema, isoDateSchema } from './common.js';
import { processes } from './coupon.js';

// ---- company settings --------------------------------------------------------------------------------

export const DEFAULT_COMPANY_SETTINGS = {
  warnDays: [30, 7],
  closedMonthAfter: 2,
  lapseWatchTime: '06:00',
} as const;

export const warnDaysSchema = z
  .array(
    z
      .number({ error: 'Enter a number of days' })
      .int('Whole days')
      .min(1, 'At least 1 day')
      .max(180, 'At most 180 days'),
    { error: 'Enter one to four lead times in days' },
  )
  .min(1, 'Enter at least one lead time')
  .max(4, 'At most four lead times')
  .refine((days) => new Set(days).size === days.length, { error: 'Each lead time only once' });

export const lapseWatchTimeSchema = z
  .string({ error: 'Enter a time' })
  .regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a 24-hour time written HH:MM, e.g. 06:00');

/** True when the runtime knows `zone` as an IANA time zone name (e.g. America/Chicago). */
export function isTimeZoneName(zone: string): boolean {
  if (zone.length === 0 || zone.length > 64) return false;
  try {
    new Intl.DateTimeFormat('en', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

export const timeZoneSchema = z
  .string({ error: 'Choose a time zone' })
  .refine(isTimeZoneName, { error: 'Choose a time zone from the list, e.g. America/Chicago' });

export const companySettingsInput = z
  .object({
    warnDays: warnDaysSchema,
    closedMonthAfter: z
      .number({ error: 'Enter a number of months' })
      .int('Whole months')
      .min(1, 'At least 1 month')
      .max(12, 'At most 12 months'),
    lapseWatchTime: lapseWatchTimeSchema,
    /** null: follow the server's time zone. */
    timeZone: timeZoneSchema.nullable(),
  })
  .partial()
  .strict();
export type CompanySettingsInput = z.infer<typeof companySettingsInput>;

export const companySettingsSchema = z.object({
  /** Lead times in days before a lapse at which supervisors are warned, largest first. */
  warnDays: z.array(z.number().int()),
  /** Months after which a continuity-log month is closed to foremen. */
  closedMonthAfter: z.number().int(),
  /** Daily time of the lapse-watch run, HH:MM in the company's time zone. */
  lapseWatchTime: z.string(),
  /** The company's time zone: its "today", day counts and the daily run's time are read in it. */
  timeZone: z.string(),
  /** True while the company follows the server's zone (no zone chosen in Settings). */
  timeZoneIsServerDefault: z.boolean(),
  serverTimeZone: z.string(),
  /** Today's date in the company's time zone. */
  today: z.string(),
  /** null while the company still runs on the defaults. */
  updatedAt: z.string().nullable(),
});
export type CompanySettings = z.infer<typeof companySettingsSchema>;

// ---- lapse watch ------------------------------------------------------------------------------------

export const lapseWatchTriggers = ['schedule', 'manual', 'cli'] as const;
/** 'sending': notices written, deliveries not all settled yet; 'done' once every one is sent, dropped or given up. */
export const lapseWatchRunStatuses = ['sending', 'done', 'skipped', 'failed'] as const;
export const deliveryStatuses = ['pending', 'sent', 'failed', 'superseded'] as const;

export const lapseWatchPreviewQuery = z.object({ asOf: isoDateSchema.optional() }).strict();
/** A run is always dated today in the company's time zone; `asOf`, if given, must be that day. */
export const lapseWatchRunInput = z.object({ asOf: isoDateSchema.optional() }).strict();
export type LapseWatchRunInput = z.infer<typeof lapseWatchRunInput>;
export const lapseWatchNoticesQuery = z
  .object({
    status: z.enum(deliveryStatuses, { error: 'Status must be pending, sent, failed or superseded' }).optional(),
  })
  .strict();

export const lapseWatchRunSchema = z.object({
  id: z.string(),
  organizationId: z.string(),
  asOf: z.string(),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  trigger: z.enum(lapseWatchTriggers),
  status: z.enum(lapseWatchRunStatuses),
  noticesCreated: z.number().int(),
  emailsSent: z.number().int(),
  emailsFailed: z.number().int(),
  /** Deliveries of the run's notices dropped before sending because they no longer applied. */
  emailsSuperseded: z.number().int(),
  error: z.string().nullable(),
});
export type LapseWatchRun = z.infer<typeof lapseWatchRunSchema>;
export const lapseWatchRunListSchema = z.object({ items: z.array(lapseWatchRunSchema) });

/** 'lapsed', 'restored' (a lapse moved away again), or a lead time in days written as text ('30', '7'). */
export const noticeThresholdSchema = z.string().regex(/^(lapsed|restored|\d{1,3})$/);

/** What a notice is about: one qualification at one threshold of its lapse date. */
const noticeSubject = z.object({
  qualificationId: z.string(),
  welder: z.object({ id: z.string(), stamp: z.string(), name: z.string() }),
  process: z.enum(processes),
  code: codeIdSchema,
  threshold: noticeThresholdSchema,
  lapsesOn: z.string(),
});

export const lapseWatchPreviewSchema = z.object({
  asOf: z.string(),
  notices: z.array(
    noticeSubject.extend({
      daysLeft: z.number().int(),
      /** The last counted evidence (logged use or passing test) of the welder and process. */
      lastUse: z.string().nullable(),
      recipients: z.array(z.object({ name: z.string(), email: z.string() })),
    }),
  ),
});
export type LapseWatchPreview = z.infer<typeof lapseWatchPreviewSchema>;

export const noticeDeliverySchema = z.object({
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  status: z.enum(deliveryStatuses),
  attempts: z.number().int(),
  nextAttemptAt: z.string().nullable(),
  lastError: z.string().nullable(),
  sentAt: z.string().nullable(),
  /** Why a delivery was dropped before sending (renewed, revoked, lapse date moved, recipient no longer supervises). */
  supersededReason: z.string().nullable(),
});

export const lapseNoticeSchema = noticeSubject.extend({
  id: z.string(),
  createdAt: z.string(),
  runId: z.string().nullable(),
  deliveries: z.array(noticeDeliverySchema),
});
export type LapseNotice = z.infer<typeof lapseNoticeSchema>;
export const lapseNoticeListSchema = z.object({ items: z.array(lapseNoticeSchema) });

// ---- overview ---------------------------------------------------------------------------------------

export const overviewSchema = z.object({
  asOf: z.string(),
  counts: z.array(
    z.object({
      shop: z.object({ id: z.string(), name: z.string(), code: z.string() }),
      current: z.number().int(),
      lapsing: z.number().int(),
      lapsed: z.number().int(),
      revoked: z.number().int(),
    }),
  ),
  /** Lapses due after today and within 90 days, per week (weeks start on Monday). */
  lapsesByWeek: z.array(z.object({ weekStart: z.string(), count: z.number().int() })),
  reviewQueue: z.number().int(),
  latestRun: lapseWatchRunSchema.nullable(),
  failedDeliveries: z.number().int(),
});
export type Overview = z.infer<typeof overviewSchema>;
