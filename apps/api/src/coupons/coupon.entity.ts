import { EntitySchema } from 'typeorm';
import { col } from '../lib/entity-columns.js';

/** A performance qualification test of one welder and its examination, as the server evaluated it. */
export interface CouponRow {
  id: string;
  organizationId: string;
  welderId: string;
  shopId: string;
  procedureId: string;
  testedOn: string;
  code: string;
  process: string;
  coupon: object;
  pipe: object | null;
  pNumbers: string[];
  examiner: object;
  labReportNumber: string;
  visual: string;
  examination: object;
  result: string;
  reasons: object;
  criteriaId: string | null;
  /** An in-house criteria set applied in addition to the code's. */
  additionalCriteriaId: string | null;
  /** The stored evaluation (couponEvaluationSchema); null for coupons recorded before rules 2.0.0. */
  evaluation: object | null;
  rulesVersion: string;
  /** The failed coupon this one retests (QW-321, AWS D1.1 retest, API 1104 retest), or null. */
  retestOfId: string | null;
  notes: string;
  /** Optimistic-lock version: an edit from a stale version gets 409. */
  version: number;
  recordedBy: string | null;
  createdAt: Date;
  updatedAt: Date;
}

export const CouponEntity = new EntitySchema<CouponRow>({
  name: 'Coupon',
  tableName: 'coupons',
  columns: {
    id: col.id(),
    organizationId: col.uuid('organization_id'),
    welderId: col.uuid('welder_id'),
    shopId: col.uuid('shop_id'),
    procedureId: col.uuid('procedure_id'),
    testedOn: { type: 'date', name: 'tested_on' },
    code: col.text('code'),
    process: col.text('process'),
    coupon: { type: 'jsonb', name: 'coupon' },
    pipe: col.jsonb('pipe'),
    pNumbers: { type: 'text', name: 'p_numbers', array: true },
    examiner: { type: 'jsonb', name: 'examiner' },
    labReportNumber: col.text('lab_report_number'),
    visual: col.text('visual'),
    examination: { type: 'jsonb', name: 'examination' },
    result: col.text('result'),
    reasons: { type: 'jsonb', name: 'reasons' },
    criteriaId: col.text('criteria_id', true),
    additionalCriteriaId: col.text('additional_criteria_id', true),
    evaluation: col.jsonb('evaluation'),
    rulesVersion: col.text('rules_version'),
    retestOfId: col.uuid('retest_of_id', true),
    notes: col.text('notes'),
    version: col.int('version'),
    recordedBy: col.uuid('recorded_by', true),
    createdAt: col.createdAt(),
    updatedAt: col.at('updated_at'),
  },
});

/** Which uploads a coupon refers to: the key to who may download them. */
export const CouponUploadEntity = new EntitySchema<{ couponId: string; uploadId: string }>({
  name: 'CouponUpload',
  tableName: 'coupon_uploads',
  columns: {
    couponId: { type: 'uuid', name: 'coupon_id', primary: true },
    uploadId: { type: 'uuid', name: 'upload_id', primary: true },
  },
});
