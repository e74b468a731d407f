// An invented example for the document tests and sample renders: Harrow Point Fabrication and its
// welder Tamsin Vell-Arroyo are made up, and so are the measurements. The ranges come from the rules
// package for this coupon: ASME IX, SMAW, pipe 6G, NPS 2 Sch 80, no backing, F-No. 4.
import { qualifiedRanges, RULES_VERSION } from '@beadroll/rules';
import type { BendSpecimenData, WalletCardData, WpqDocumentData } from '../document-data.js';

export const VERIFY_URL = 'https://beadroll.example/verify/7Qm2xK9vLp4TnR8wZc3H';

export function exampleWpq(overrides: Partial<WpqDocumentData> = {}): WpqDocumentData {
  return {
    company: { name: 'Harrow Point Fabrication' },
    welder: { name: 'Tamsin Vell-Arroyo', stamp: 'ST-12' },
    qualification: {
      id: '5d0a3c1e-7b2f-4e9a-8c6d-1f2e3a4b5c6d',
      number: 'WPQ-2025-0147',
      code: 'asme-ix',
      process: 'SMAW',
      wps: { number: 'HPF-S101', revision: '3' },
      certifiedOn: '2025-03-18',
      certifiedBy: { name: 'Odile Fenwright', title: 'QA Manager' },
    },
    coupon: {
      testedOn: '2025-03-12',
      shopName: 'North Yard',
      form: 'pipe',
      nps: '2',
      schedule: '80',
      outsideDiameter: { value: 2.375, unit: 'in' },
      thickness: { value: 0.218, unit: 'in' },
      weld: 'groove',
      position: '6G',
      depositedThickness: { value: 0.218, unit: 'in' },
      layers: 3,
      backing: false,
      fNumber: 4,
      pNumbers: ['1', '1'],
      progression: 'uphill',
      examiner: { name: 'Brannoc Lisle', certificateNumber: 'EX-4471' },
      labReportNumber: 'LR-25-0392',
    },
    examination: {
      visual: { result: 'accept' },
      test: {
        method: 'bend',
        criteria: 'asme-ix',
        result: 'accept',
        specimens: [
          {
            label: 'F1',
            kind: 'face',
            result: 'accept',
            discontinuities: [{ sizeText: '1/32', size: { value: 1 / 32, unit: 'in' }, location: 'surface', type: 'porosity' }],
            reasons: [],
          },
          { label: 'F2', kind: 'face', result: 'accept', discontinuities: [], reasons: [] },
          {
            label: 'R1',
            kind: 'root',
            result: 'accept',
            discontinuities: [
              { sizeText: '1/16 in', location: 'surface', type: 'slag', fusionRelated: true },
              { sizeText: '3/16', location: 'corner', type: 'crack', fusionRelated: false },
            ],
            reasons: [],
          },
          { label: 'R2', kind: 'root', result: 'accept', discontinuities: [], reasons: [] },
        ],
      },
    },
    ranges: qualifiedRanges({
      code: 'asme-ix',
      process: 'SMAW',
      form: 'pipe',
      weld: 'groove',
      position: '6G',
      thickness: { value: 0.218, unit: 'in' },
      depositedThickness: { value: 0.218, unit: 'in' },
      layers: 3,
      outsideDiameter: { value: 2.375, unit: 'in' },
      backing: false,
      fNumber: 4,
      progression: 'uphill',
    }),
    rulesVersion: RULES_VERSION,
    status: { state: 'current', lapsesOn: '2025-11-30', asOf: '2025-06-02' },
    verifyUrl: VERIFY_URL,
    ...overrides,
  };
}

/**
 * A coupon with many specimens and discontinuities, so the record runs over several pages. Specimen
 * B08 was disregarded for a corner crack (AWS D1.1 corner rule) and the last one is its replacement.
 */
export function manySpecimens(count: number): BendSpecimenData[] {
  return Array.from({ length: count }, (_, i): BendSpecimenData => ({
    label: `B${String(i + 1).padStart(2, '0')}`,
    kind: i % 2 === 0 ? 'side' : 'face',
    result: i === 7 ? 'replace-specimen' : 'accept',
    discontinuities: [
      { sizeText: '1/32', location: 'surface', type: 'porosity' },
      { sizeText: `${i + 1}/64 in`, location: 'surface', type: 'slag', fusionRelated: true },
      { sizeText: '2 mm', location: 'corner', type: 'crack' },
    ],
    reasons:
      i === 7
        ? [
            {
              clause: 'AWS D1.1 4.9.3.3',
              message:
                'Corner crack of 5/16 in exceeds 1/4 in without slag or fusion cause: specimen disregarded, replacement tested.',
            },
          ]
        : [],
  }));
}

export function exampleCard(overrides: Partial<WalletCardData> = {}): WalletCardData {
  return {
    company: { name: 'Harrow Point Fabrication' },
    welder: { name: 'Tamsin Vell-Arroyo', stamp: 'ST-12', homeShop: 'North Yard' },
    issuedOn: '2025-06-02',
    verifyUrl: VERIFY_URL,
    qualifications: [
      {
        code: 'asme-ix',
        process: 'SMAW',
        positions: { groove: ['F', 'H', 'V', 'O'], fillet: ['F', 'H', 'V', 'O'] },
        thickness: 'up to 0.436 in',
        diameter: '1 in OD and over',
        fNumbers: [1, 2, 3, 4],
        lapsesOn: '2025-11-30',
        state: 'current',
      },
      {
        code: 'aws-d1.1',
        process: 'FCAW',
        positions: { groove: ['F', 'H', 'V'], fillet: ['F', 'H', 'V'] },
        thickness: '1/8 in to 3/4 in',
        diameter: '24 in OD and over',
        fNumbers: [6],
        lapsesOn: '2025-06-20',
        state: 'lapsing',
      },
      {
        code: 'iso-9606-1',
        process: 'GTAW',
        positions: { groove: ['F', 'H'], fillet: ['F', 'H'] },
        thickness: '3 mm to 8 mm',
        diameter: '500 mm OD and over',
        fNumbers: [],
        lapsesOn: '2025-10-04',
        state: 'current',
      },
    ],
    ...overrides,
  };
}
