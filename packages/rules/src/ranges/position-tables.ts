// Positions qualified by each test position, per code and coupon form (TRADE.md §3), as data.
// Each row: groove positions and fillet positions qualified. A missing row = the code has no such test.
import { type CodeId } from '../schemas/common.js';
import { type Progression } from '../schemas/coupon.js';
import { type SingleTestPosition, type WeldingPosition } from './positions.js';

export type PositionRow = { groove: WeldingPosition[]; fillet: WeldingPosition[] };
export type PositionTable = Partial<Record<SingleTestPosition, PositionRow>>;
export type PositionTableSet = {
  clause: string;
  source: LimitSource;
  plate: PositionTable;
  pipe: PositionTable;
  /** Tables that depend on the vertical progression (ISO 6947 names PF/PG, PH/PJ, H-L045/J-L045). */
  byProgression?: Record<Progression, { plate: PositionTable; pipe: PositionTable }>;
};

export type LimitSource = 'published' | 'from-memory' | 'regulation' | 'common-practice' | 'beadroll-default';

const ALL: WeldingPosition[] = ['F', 'H', 'V', 'O'];

// Fillet weld tests qualify fillet welds only (from memory: QW-461.9 fillet rows; AWS D1.1 Table 4.10).
const filletTestsPlate: PositionTable = {
  '1F': { groove: [], fillet: ['F'] },
  '2F': { groove: [], fillet: ['F', 'H'] },
  '3F': { groove: [], fillet: ['F', 'H', 'V'] },
  '4F': { groove: [], fillet: ['F', 'H', 'O'] },
};
const filletTestsPipe: PositionTable = {
  '1F': { groove: [], fillet: ['F'] },
  '2F': { groove: [], fillet: ['F', 'H'] },
  '2FR': { groove: [], fillet: ['F', 'H'] },
  '4F': { groove: [], fillet: ['F', 'H', 'O'] },
  '5F': { groove: [], fillet: ALL },
};

const asmeIx: PositionTableSet = {
  clause: 'QW-461.9',
  source: 'from-memory',
  plate: {
    '1G': { groove: ['F'], fillet: ['F'] },
    '2G': { groove: ['F', 'H'], fillet: ['F', 'H'] },
    '3G': { groove: ['F', 'V'], fillet: ['F', 'H', 'V'] },
    '4G': { groove: ['F', 'O'], fillet: ['F', 'H', 'O'] },
    ...filletTestsPlate,
  },
  pipe: {
    '1G': { groove: ['F'], fillet: ['F'] },
    '2G': { groove: ['F', 'H'], fillet: ['F', 'H'] },
    '5G': { groove: ['F', 'V', 'O'], fillet: ALL },
    '6G': { groove: ALL, fillet: ALL },
    ...filletTestsPipe,
  },
};

const awsD11: PositionTableSet = {
  clause: 'AWS D1.1 Table 4.10 (2015)',
  // the plate fillet column is from published copies of the table; the rest is recalled
  source: 'from-memory',
  plate: {
    '1G': { groove: ['F'], fillet: ['F', 'H'] },
    '2G': { groove: ['F', 'H'], fillet: ['F', 'H'] },
    '3G': { groove: ['F', 'H', 'V'], fillet: ['F', 'H', 'V'] },
    '4G': { groove: ['F', 'O'], fillet: ['F', 'H', 'O'] },
    ...filletTestsPlate,
  },
  pipe: {
    '1G': { groove: ['F'], fillet: ['F', 'H'] },
    '2G': { groove: ['F', 'H'], fillet: ['F', 'H'] },
    '5G': { groove: ['F', 'V', 'O'], fillet: ['F', 'V', 'O'] },
    '6G': { groove: ALL, fillet: ALL },
    '6GR': { groove: ALL, fillet: ALL },
    ...filletTestsPipe,
  },
};

// API 1104 speaks of rolled, fixed and inclined pipe rather than F/H/V/O; the same physical positions as
// the ASME pipe rows are used, and a fixed test at 45° qualifies all positions.
const api1104: PositionTableSet = {
  clause: 'API 1104 single qualification (position)',
  source: 'from-memory',
  plate: {},
  pipe: asmeIx.pipe,
};

// ISO 9606-1: butt welds do not qualify fillet welds (without a supplementary fillet test), and the
// vertical positions PF/PG (and PH/PJ, H-L045/J-L045) are different positions.
const isoUp = {
  plate: {
    '1G': { groove: ['F'], fillet: [] },
    '2G': { groove: ['F', 'H'], fillet: [] },
    '3G': { groove: ['F', 'V'], fillet: [] },
    '4G': { groove: ['F', 'H', 'O'], fillet: [] },
    '1F': { groove: [], fillet: ['F'] },
    '2F': { groove: [], fillet: ['F', 'H'] },
    '3F': { groove: [], fillet: ['F', 'H', 'V'] },
    '4F': { groove: [], fillet: ['F', 'H', 'O'] },
  },
  pipe: {
    '1G': { groove: ['F'], fillet: [] },
    '2G': { groove: ['F', 'H'], fillet: [] },
    '5G': { groove: ['F', 'V', 'O'], fillet: [] },
    '6G': { groove: ALL, fillet: [] },
    '1F': { groove: [], fillet: ['F'] },
    '2F': { groove: [], fillet: ['F', 'H'] },
    '4F': { groove: [], fillet: ['F', 'H', 'O'] },
    '5F': { groove: [], fillet: ALL },
  },
} satisfies { plate: PositionTable; pipe: PositionTable };

const isoDown = {
  plate: {
    ...isoUp.plate,
    '3G': { groove: ['V'], fillet: [] },
    '3F': { groove: [], fillet: ['V'] },
  },
  pipe: {
    ...isoUp.pipe,
    '5G': { groove: ['F', 'V', 'O'], fillet: [] },
    '6G': { groove: ALL, fillet: [] },
    '5F': { groove: [], fillet: ALL },
  },
} satisfies { plate: PositionTable; pipe: PositionTable };

const iso96061: PositionTableSet = {
  clause: 'ISO 9606-1 welding positions',
  source: 'from-memory',
  plate: isoUp.plate,
  pipe: isoUp.pipe,
  byProgression: { uphill: isoUp, downhill: isoDown },
};

export const positionTables: Record<CodeId, PositionTableSet> = {
  'asme-ix': asmeIx,
  'aws-d1.1': awsD11,
  'api-1104': api1104,
  'iso-9606-1': iso96061,
};
