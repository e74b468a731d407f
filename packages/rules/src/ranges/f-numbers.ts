// ASME IX QW-433 filler metal interchange for F-No. 1 to 6 (TRADE.md §5, from memory: ASME QW-433).
// A test with the F-No. and backing on the left qualifies welding with every F-No./backing on the right.

export type Backing = 'with' | 'without';
export type FNumberQualification = { fNumber: number; backing: Backing[] };
export type FNumberInterchangeRow = {
  tested: { fNumber: number; backing: Backing };
  qualifies: FNumberQualification[];
};

const both: Backing[] = ['with', 'without'];
const withOnly: Backing[] = ['with'];

export const fNumberInterchange: readonly FNumberInterchangeRow[] = [
  { tested: { fNumber: 1, backing: 'with' }, qualifies: [{ fNumber: 1, backing: withOnly }] },
  { tested: { fNumber: 1, backing: 'without' }, qualifies: [{ fNumber: 1, backing: both }] },
  {
    tested: { fNumber: 2, backing: 'with' },
    qualifies: [
      { fNumber: 1, backing: withOnly },
      { fNumber: 2, backing: withOnly },
    ],
  },
  {
    tested: { fNumber: 2, backing: 'without' },
    qualifies: [
      { fNumber: 1, backing: withOnly },
      { fNumber: 2, backing: both },
    ],
  },
  {
    tested: { fNumber: 3, backing: 'with' },
    qualifies: [
      { fNumber: 1, backing: withOnly },
      { fNumber: 2, backing: withOnly },
      { fNumber: 3, backing: withOnly },
    ],
  },
  {
    tested: { fNumber: 3, backing: 'without' },
    qualifies: [
      { fNumber: 1, backing: withOnly },
      { fNumber: 2, backing: withOnly },
      { fNumber: 3, backing: both },
    ],
  },
  {
    tested: { fNumber: 4, backing: 'with' },
    qualifies: [
      { fNumber: 1, backing: withOnly },
      { fNumber: 2, backing: withOnly },
      { fNumber: 3, backing: withOnly },
      { fNumber: 4, backing: withOnly },
    ],
  },
  {
    tested: { fNumber: 4, backing: 'without' },
    qualifies: [
      { fNumber: 1, backing: withOnly },
      { fNumber: 2, backing: withOnly },
      { fNumber: 3, backing: withOnly },
      { fNumber: 4, backing: both },
    ],
  },
  { tested: { fNumber: 5, backing: 'with' }, qualifies: [{ fNumber: 5, backing: withOnly }] },
  { tested: { fNumber: 5, backing: 'without' }, qualifies: [{ fNumber: 5, backing: both }] },
  { tested: { fNumber: 6, backing: 'with' }, qualifies: [{ fNumber: 6, backing: withOnly }] },
  { tested: { fNumber: 6, backing: 'without' }, qualifies: [{ fNumber: 6, backing: both }] },
];

/** The interchange row for a test, or undefined for an F-No. outside the table. */
export const fNumberRow = (fNumber: number, backing: Backing): FNumberInterchangeRow | undefined =>
  fNumberInterchange.find((r) => r.tested.fNumber === fNumber && r.tested.backing === backing);

/** ASME IX F-Number groups outside the F-No. 1–6 table (from memory: QW-433). Each group's members
 *  qualify each other; a member listed alone qualifies itself only. */
export type FNumberGroup = { members: readonly number[]; text: string };
export const asmeFNumberGroups: readonly FNumberGroup[] = [
  { members: [21, 22, 23, 24, 25, 26], text: 'F-No. 21 to 26 (aluminium) qualify each other' },
  {
    members: [34, 41, 42, 43, 44, 45, 46],
    text: 'F-No. 34 and 41 to 46 (copper-nickel and nickel) qualify each other',
  },
  { members: [51, 52, 53, 54, 55], text: 'F-No. 51 to 55 (titanium) qualify each other' },
  { members: [61], text: 'F-No. 61 (zirconium) qualifies itself only' },
  ...[31, 32, 33, 35, 36, 37].map((f) => ({
    members: [f],
    text: `F-No. ${f} (copper) qualifies itself only`,
  })),
  { members: [71], text: 'F-No. 71 (hard-facing) qualifies itself only' },
  { members: [72], text: 'F-No. 72 (hard-facing) qualifies itself only' },
];

/** AWS D1.1, SMAW only: the electrode F-No. tested qualifies itself and every lower one, with or without
 *  backing (from memory: D1.1-2015 Table 4.12 item (2), Table 4.13). */
export const awsSmawFNumbers: Readonly<Record<number, readonly number[]>> = {
  1: [1],
  2: [1, 2],
  3: [1, 2, 3],
  4: [1, 2, 3, 4],
};
