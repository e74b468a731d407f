// Welded and seamless wrought steel pipe, ASME B36.10M: outside diameter and nominal wall in inches for
// NPS 1/2 through 24 and the schedules Beadroll offers on its forms. A schedule missing from a row does
// not exist for that size in the standard. Values recalled from the handbook table (from memory: ASME
// B36.10M); the NPS 2 and NPS 6 rows were checked against the values written down in TRADE.md §7.

export const pipeSchedules = ['40', '80', '120', '160', 'STD', 'XS', 'XXS'] as const;
export type PipeSchedule = (typeof pipeSchedules)[number];

export type PipeSizeRow = {
  nps: string;
  /** Outside diameter, inches. */
  od: number;
  /** Nominal wall by schedule, inches. */
  walls: Partial<Record<PipeSchedule, number>>;
};

export const b3610mPipeSizes: readonly PipeSizeRow[] = [
  {
    nps: '1/2',
    od: 0.84,
    walls: { '40': 0.109, STD: 0.109, '80': 0.147, XS: 0.147, '160': 0.188, XXS: 0.294 },
  },
  {
    nps: '3/4',
    od: 1.05,
    walls: { '40': 0.113, STD: 0.113, '80': 0.154, XS: 0.154, '160': 0.219, XXS: 0.308 },
  },
  {
    nps: '1',
    od: 1.315,
    walls: { '40': 0.133, STD: 0.133, '80': 0.179, XS: 0.179, '160': 0.25, XXS: 0.358 },
  },
  {
    nps: '1-1/4',
    od: 1.66,
    walls: { '40': 0.14, STD: 0.14, '80': 0.191, XS: 0.191, '160': 0.25, XXS: 0.382 },
  },
  { nps: '1-1/2', od: 1.9, walls: { '40': 0.145, STD: 0.145, '80': 0.2, XS: 0.2, '160': 0.281, XXS: 0.4 } },
  {
    nps: '2',
    od: 2.375,
    walls: { '40': 0.154, STD: 0.154, '80': 0.218, XS: 0.218, '160': 0.344, XXS: 0.436 },
  },
  {
    nps: '2-1/2',
    od: 2.875,
    walls: { '40': 0.203, STD: 0.203, '80': 0.276, XS: 0.276, '160': 0.375, XXS: 0.552 },
  },
  { nps: '3', od: 3.5, walls: { '40': 0.216, STD: 0.216, '80': 0.3, XS: 0.3, '160': 0.438, XXS: 0.6 } },
  { nps: '3-1/2', od: 4.0, walls: { '40': 0.226, STD: 0.226, '80': 0.318, XS: 0.318 } },
  {
    nps: '4',
    od: 4.5,
    walls: { '40': 0.237, STD: 0.237, '80': 0.337, XS: 0.337, '120': 0.438, '160': 0.531, XXS: 0.674 },
  },
  {
    nps: '5',
    od: 5.563,
    walls: { '40': 0.258, STD: 0.258, '80': 0.375, XS: 0.375, '120': 0.5, '160': 0.625, XXS: 0.75 },
  },
  {
    nps: '6',
    od: 6.625,
    walls: { '40': 0.28, STD: 0.28, '80': 0.432, XS: 0.432, '120': 0.562, '160': 0.719, XXS: 0.864 },
  },
  {
    nps: '8',
    od: 8.625,
    walls: { '40': 0.322, STD: 0.322, '80': 0.5, XS: 0.5, '120': 0.719, '160': 0.906, XXS: 0.875 },
  },
  {
    nps: '10',
    od: 10.75,
    walls: { '40': 0.365, STD: 0.365, '80': 0.594, XS: 0.5, '120': 0.844, '160': 1.125, XXS: 1.0 },
  },
  {
    nps: '12',
    od: 12.75,
    walls: { '40': 0.406, STD: 0.375, '80': 0.688, XS: 0.5, '120': 1.0, '160': 1.312, XXS: 1.0 },
  },
  {
    nps: '14',
    od: 14.0,
    walls: { '40': 0.438, STD: 0.375, '80': 0.75, XS: 0.5, '120': 1.094, '160': 1.406 },
  },
  { nps: '16', od: 16.0, walls: { '40': 0.5, STD: 0.375, '80': 0.844, XS: 0.5, '120': 1.219, '160': 1.594 } },
  {
    nps: '18',
    od: 18.0,
    walls: { '40': 0.562, STD: 0.375, '80': 0.938, XS: 0.5, '120': 1.375, '160': 1.781 },
  },
  { nps: '20', od: 20.0, walls: { '40': 0.594, STD: 0.375, '80': 1.031, XS: 0.5, '120': 1.5, '160': 1.969 } },
  { nps: '22', od: 22.0, walls: { STD: 0.375, '80': 1.125, XS: 0.5, '120': 1.625, '160': 2.125 } },
  {
    nps: '24',
    od: 24.0,
    walls: { '40': 0.688, STD: 0.375, '80': 1.219, XS: 0.5, '120': 1.812, '160': 2.344 },
  },
];
