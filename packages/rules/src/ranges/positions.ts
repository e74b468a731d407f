// Test positions (US designations as the codes write them) and the ISO 6947 names beside them.

export const weldingPositions = ['F', 'H', 'V', 'O'] as const;
export type WeldingPosition = (typeof weldingPositions)[number];

export const weldingPositionNames: Record<WeldingPosition, string> = {
  F: 'flat',
  H: 'horizontal',
  V: 'vertical',
  O: 'overhead',
};

export const grooveTestPositions = ['1G', '2G', '3G', '4G', '5G', '6G', '6GR'] as const;
export const filletTestPositions = ['1F', '2F', '2FR', '3F', '4F', '5F'] as const;
/** Combined tests on one qualification, e.g. a 3G plate and a 4G plate, or a 2G + 5G pipe coupon. */
export const combinedTestPositions = ['3G+4G', '2G+3G+4G', '2G+5G', '3F+4F'] as const;
export const testPositions = [
  ...grooveTestPositions,
  ...filletTestPositions,
  ...combinedTestPositions,
] as const;
export type TestPosition = (typeof testPositions)[number];
export type SingleTestPosition = (typeof grooveTestPositions)[number] | (typeof filletTestPositions)[number];

export const testPositionNames: Record<TestPosition, string> = {
  '1G': 'flat groove (pipe rolled)',
  '2G': 'horizontal groove (pipe axis vertical)',
  '3G': 'vertical groove',
  '4G': 'overhead groove',
  '5G': 'pipe fixed horizontal',
  '6G': 'pipe fixed at 45°',
  '6GR': 'pipe fixed at 45° with a restriction ring (T-, K-, Y-connections)',
  '1F': 'flat fillet',
  '2F': 'horizontal fillet',
  '2FR': 'horizontal fillet, pipe rotated',
  '3F': 'vertical fillet',
  '4F': 'overhead fillet',
  '5F': 'pipe fixed horizontal, fillet',
  '3G+4G': 'vertical and overhead groove',
  '2G+3G+4G': 'horizontal, vertical and overhead groove',
  '2G+5G': 'horizontal and fixed horizontal pipe groove',
  '3F+4F': 'vertical and overhead fillet',
};

export const splitTestPosition = (p: TestPosition): SingleTestPosition[] =>
  p.split('+') as SingleTestPosition[];
// '2FR' (rotated pipe) ends in R: a fillet test is any position without a groove part.
export const isFilletTest = (p: TestPosition): boolean => !p.includes('G');

/** ISO 6947 position designations and their nearest US names (TRADE.md §7). */
export const iso6947Positions: ReadonlyArray<{ iso: string; name: string; us: string[] }> = [
  { iso: 'PA', name: 'flat', us: ['1G', '1F'] },
  { iso: 'PB', name: 'horizontal fillet', us: ['2F'] },
  { iso: 'PC', name: 'horizontal butt', us: ['2G'] },
  { iso: 'PD', name: 'overhead fillet', us: ['4F'] },
  { iso: 'PE', name: 'overhead butt', us: ['4G'] },
  { iso: 'PF', name: 'vertical up', us: ['3G uphill'] },
  { iso: 'PG', name: 'vertical down', us: ['3G downhill'] },
  { iso: 'PH', name: 'fixed pipe, welding upward', us: ['5G uphill'] },
  { iso: 'PJ', name: 'fixed pipe, welding downward', us: ['5G downhill'] },
  { iso: 'H-L045', name: 'pipe inclined at 45°, welding upward', us: ['6G uphill'] },
  { iso: 'J-L045', name: 'pipe inclined at 45°, welding downward', us: ['6G downhill'] },
];
