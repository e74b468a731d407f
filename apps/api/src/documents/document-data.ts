// The plain inputs of Beadroll's PDF documents. The service that loads a qualification from the database
// builds these; the renderers know nothing of TypeORM or HTTP. Domain words and shapes come from the
// rules package, so the output of `qualifiedRanges` goes in as it is.

import type {
  Backing,
  BendResult,
  CodeId,
  ContinuityState,
  CriteriaId,
  IsoDate,
  Length,
  Process,
  Progression,
  QualifiedRanges,
  TransferMode,
  WeldingPosition,
} from '@beadroll/rules';

export type {
  Backing,
  BendResult,
  CodeId,
  CriteriaId,
  IsoDate,
  Length,
  Process,
  Progression,
  TransferMode,
  WeldingPosition,
};
export type ExaminationResult = 'accept' | 'reject';
export type QualificationState = ContinuityState;

/**
 * What the WPQ prints of `qualifiedRanges(coupon)`: its output (or the copy stored at certification)
 * can be passed as it is. Lengths keep the unit the coupon was recorded in; null ends are open.
 */
export type QualifiedRangesData = Pick<
  QualifiedRanges,
  'positions' | 'thickness' | 'diameter' | 'fNumbers' | 'backing' | 'progression' | 'limits'
> &
  Partial<Pick<QualifiedRanges, 'transferModes'>>;

export type DiscontinuityData = {
  /** The size exactly as the examiner typed it ('3/16', '1-1/4 in', '4 mm'). */
  sizeText: string;
  /** The size as read; printed with its unit when the typed text has none ('3/16' → '3/16 in'). */
  size?: Length;
  location: 'surface' | 'corner';
  type?: 'crack' | 'porosity' | 'slag' | 'lack-of-fusion' | 'undercut' | 'tear' | 'other';
  fusionRelated?: boolean;
};

export type BendSpecimenData = {
  /** The label marked on the specimen, e.g. 'R1'. */
  label?: string;
  kind: 'face' | 'root' | 'side';
  result: BendResult;
  discontinuities: DiscontinuityData[];
  reasons: Array<{ clause: string; message: string }>;
};

export type BendExaminationData = {
  method: 'bend';
  /** A named criteria set, or the name of a company's own set. */
  criteria: CriteriaId | (string & {});
  result: BendResult;
  specimens: BendSpecimenData[];
};

export type VolumetricExaminationData = {
  method: 'radiography' | 'ultrasonic';
  result: ExaminationResult;
  reportNumber: string;
  remarks?: string;
};

/** A part of the examination other than the visual examination and the bends (radiography or
 *  ultrasonics with their indications, fillet weld break, macro-etch, nick-breaks, the processes of a
 *  combination coupon, a retest), as it was performed and judged. */
export type ExaminationPartData = {
  /** In the trade's words: 'Radiography', 'Fillet weld break', 'Nick-break tests'. */
  name: string;
  result: BendResult;
  /** The criteria it was judged by, with the clause: 'ASME IX QW-191.1.2.2'. */
  judgedBy?: string;
  /** What was recorded, one line each ('Rounded indication (porosity), 1/16 in'). */
  findings: string[];
  reasons: Array<{ clause: string; message: string }>;
};

export type WpqDocumentData = {
  company: { name: string };
  welder: { name: string; stamp: string };
  qualification: {
    id: string;
    /** The company's record number, 'WPQ-2026-0042', printed instead of the id. */
    number: string;
    code: CodeId;
    process: Process;
    transferMode?: TransferMode;
    wps: { number: string; revision: string };
    certifiedOn: IsoDate;
    certifiedBy: { name: string; title: string };
  };
  coupon: {
    testedOn: IsoDate;
    shopName: string;
    form: 'plate' | 'pipe';
    /** Pipe given by size: NPS ('2', '1/2') and schedule ('80', 'XS'). */
    nps?: string;
    schedule?: string;
    outsideDiameter?: Length;
    /** Plate thickness or pipe wall. */
    thickness: Length;
    weld: 'groove' | 'fillet';
    position: string;
    depositedThickness?: Length;
    layers?: number;
    backing: boolean;
    fNumber?: number;
    /** Base metal P-Numbers of the two members, e.g. ['1', '1']. */
    pNumbers: string[];
    progression?: Progression;
    examiner: { name: string; certificateNumber: string };
    labReportNumber?: string;
  };
  examination: {
    visual: { result: ExaminationResult; remarks?: string };
    /** The bends or the radiography/ultrasonics in their place; absent for a fillet coupon. */
    test?: BendExaminationData | VolumetricExaminationData;
    /** The coupon's verdict on the whole examination (the server's evaluation). */
    result?: BendResult;
    /** Visual findings, one line each. */
    visualFindings?: string[];
    /** Every other part performed, in the order it was judged. */
    parts?: ExaminationPartData[];
  };
  ranges: QualifiedRangesData;
  rulesVersion: string;
  /** The qualification's continuity status on `asOf` (the day the PDF is made). */
  status?: { state: QualificationState; lapsesOn: IsoDate; asOf: IsoDate };
  verifyUrl?: string;
  /** Paper size; Letter unless the company prints on A4. */
  paper?: 'LETTER' | 'A4';
};

export type WalletCardQualification = {
  code: CodeId;
  process: Process;
  positions: { groove: WeldingPosition[]; fillet: WeldingPosition[] };
  /** Already formatted, e.g. '3/16 in to 3/4 in' (see `formatThicknessRange`). */
  thickness: string;
  /** Already formatted, e.g. '1 in OD and over' (see `formatDiameterRange`). */
  diameter: string;
  fNumbers: number[];
  lapsesOn: IsoDate;
  state: QualificationState;
};

export type WalletCardData = {
  company: { name: string };
  welder: { name: string; stamp: string; homeShop: string };
  issuedOn: IsoDate;
  /** The welder's live verify link; null when none is issued (the card then prints without a QR code). */
  verifyUrl: string | null;
  /** The welder's current (and lapsing) qualifications; lapsed and revoked ones do not belong on a card. */
  qualifications: WalletCardQualification[];
};
