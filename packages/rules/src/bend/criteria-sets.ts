// The named bend-test acceptance sets, each an instance of the one BendCriteria shape (TRADE.md §1).
// The codes give each limit in inches with an SI value beside it (1/8 in and 3 mm); both are kept so a
// measurement is judged in the system it was recorded in.
import { type CriteriaId } from '../schemas/common.js';
import { type BendCriteria } from '../schemas/bend.js';

const asmeIx: BendCriteria = {
  id: 'asme-ix',
  name: 'ASME Section IX guided bend',
  clause: 'ASME IX QW-163',
  source: 'published: ASME IX QW-163 (published copies, read second-hand)',
  single: { max: { in: 1 / 8, mm: 3 } },
  cumulative: null,
  corner: { ignore: 'unless-fusion-related', allowance: null },
};

const awsD11: BendCriteria = {
  id: 'aws-d1.1',
  name: 'AWS D1.1 guided bend',
  clause: 'AWS D1.1 4.9.3.3 (2015; 6.10.3.3 area in 2020)',
  source: 'from memory: AWS D1.1 4.9.3.3 (2015 edition), 6.10.3.3 area (2020)',
  single: { max: { in: 1 / 8, mm: 3 } },
  cumulative: { max: { in: 3 / 8, mm: 10 }, countAbove: { in: 1 / 32, mm: 1 } },
  corner: {
    ignore: 'unless-fusion-related',
    allowance: { max: { in: 1 / 4, mm: 6 }, inclusive: true, over: 'replace-specimen' },
  },
};

const api1104: BendCriteria = {
  id: 'api-1104',
  name: 'API 1104 bend test',
  clause: 'API 1104 bend test acceptance',
  source: 'from memory: API 1104 bend test acceptance',
  single: { max: { in: 1 / 8, mm: 3 }, wallFraction: 0.5 },
  cumulative: null,
  corner: {
    ignore: 'unless-fusion-related',
    // only cracks along the edges are set aside; any other imperfection there is an obvious one
    causes: ['slag', 'lack-of-fusion', 'porosity', 'undercut', 'other'],
    allowance: { max: { in: 1 / 4, mm: 6 }, inclusive: false, over: 'judge' },
  },
};

// ISO 9606-1 gives the limit in millimetres only; an inch measurement is judged against 3 mm converted.
const iso96061: BendCriteria = {
  id: 'iso-9606-1',
  name: 'ISO 9606-1 bend test',
  clause: 'ISO 9606-1 bend test evaluation',
  source: 'from memory: ISO 9606-1 (bend test evaluation)',
  single: { max: { mm: 3 } },
  cumulative: null,
  corner: { ignore: 'unless-fusion-related', allowance: null },
};

const shopGeneral: BendCriteria = {
  id: 'shop-general',
  name: 'Shop practice (in-house and training tests)',
  clause: 'Shop practice',
  source: 'common practice (no source): a typical in-house and training criterion',
  single: { max: { in: 1 / 8 } },
  cumulative: { max: { in: 1 / 4 } },
  corner: {
    ignore: 'unless-fusion-related',
    allowance: { max: { in: 1 / 4 }, inclusive: true, over: 'reject' },
  },
};

export const criteriaSets: Record<CriteriaId, BendCriteria> = {
  'asme-ix': asmeIx,
  'aws-d1.1': awsD11,
  'api-1104': api1104,
  'iso-9606-1': iso96061,
  'shop-general': shopGeneral,
};
