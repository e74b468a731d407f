import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** One invocation of the lapse-watch job for one company (skipped ones too). */
export interface LapseWatchRunRow {
  id: string;
  organizationId: string;
  asOf: string;
  startedAt: Date;
  finishedAt: Date | null;
  trigger: 'schedule' | 'manual' | 'cli';
  instance: string;
  status: 'sending' | 'done' | 'skipped' | 'failed';
  noticesCreated: number;
  emailsSent: number;
  emailsFailed: number;
  emailsSuperseded: number;
  error: string | null;
}

export const LapseWatchRunEntity = new EntitySchema<LapseWatchRunRow>({
  name: 'LapseWatchRun',
  tableName: 'lapse_watch_runs',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    asOf: { type: 'date', name: 'as_of' },
    startedAt: col.at('started_at'),
    finishedAt: col.at('finished_at', true),
    trigger: col.text('trigger'),
    instance: col.text('instance'),
    status: col.text('status'),
    noticesCreated: col.int('notices_created'),
    emailsSent: col.int('emails_sent'),
    emailsFailed: col.int('emails_failed'),
    emailsSuperseded: col.int('emails_superseded'),
    error: col.text('error', true),
  },
});

/** The outbox: one notice per qualification, threshold and lapse date. */
export interface LapseNoticeRow {
  id: string;
  organizationId: string;
  qualificationId: string;
  threshold: string;
  lapsesOn: string;
  createdAt: Date;
  runId: string | null;
}

export const LapseNoticeEntity = new EntitySchema<LapseNoticeRow>({
  name: 'LapseNotice',
  tableName: 'lapse_notices',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    qualificationId: col.uuid('qualification_id'),
    threshold: col.text('threshold'),
    lapsesOn: { type: 'date', name: 'lapses_on' },
    createdAt: col.createdAt(),
    runId: col.uuid('run_id', true),
  },
});

/** One notice to one recipient: sent in a digest, or pending with its retry state. */
export interface NoticeDeliveryRow {
  id: string;
  /** A lapse notice, or (weldNoticeId) a weld flagged by a re-check: exactly one of the two. */
  noticeId: string | null;
  weldNoticeId: string | null;
  userId: string;
  email: string;
  status: 'pending' | 'sent' | 'failed' | 'superseded';
  attempts: number;
  nextAttemptAt: Date | null;
  lastError: string | null;
  sentAt: Date | null;
  /** The Message-ID the SMTP server accepted the digest under. */
  messageId: string | null;
  /** A sender's lease on the delivery (lapse-sender.ts). */
  claimToken: string | null;
  claimedUntil: Date | null;
  /** When it was sent, given up or superseded. */
  settledAt: Date | null;
  supersededReason: string | null;
}

export const NoticeDeliveryEntity = new EntitySchema<NoticeDeliveryRow>({
  name: 'NoticeDelivery',
  tableName: 'notice_deliveries',
  columns: {
    id: col.id(),
    noticeId: col.uuid('notice_id', true),
    weldNoticeId: col.uuid('weld_notice_id', true),
    userId: col.uuid('user_id'),
    email: col.text('email'),
    status: col.text('status'),
    attempts: col.int('attempts'),
    nextAttemptAt: col.at('next_attempt_at', true),
    lastError: col.text('last_error', true),
    sentAt: col.at('sent_at', true),
    messageId: col.text('message_id', true),
    claimToken: col.uuid('claim_token', true),
    claimedUntil: col.at('claimed_until', true),
    settledAt: col.at('settled_at', true),
    supersededReason: col.text('superseded_reason', true),
  },
});
