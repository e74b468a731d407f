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
