// Import of existing qualifications from paper WPQs: welder stamp, code, process, test date, WPS and the
// coupon's variables. The ranges are computed by the rules from the coupon, exactly as a certification
// computes them; where the paper record states different ranges, both are kept (qualification_paper_records)
// and the difference waits for the QA manager to settle it. Each row becomes a coupon recorded as the paper
// states it (passed; examination as the paper names it) and its certified qualification. Natural key:
// welder + code + process + test date — a row already on record with the same variables is unchanged, one
// with other variables is refused (certified records are never edited; a correction supersedes on the
// Coupons screen), one whose paper ranges changed updates the paper record only.
import { randomUUID } from 'node:crypto';
import {
  RULES_VERSION,
  RulesInputError,
  codeIds,
  couponSchema,
  parseLength,
  pipeDimensions,
  processes,
  parseStatedRanges,
  qualifiedRanges,
  rangeDifferences,
  statedRangeVariables,
  type CodeId,
  type Coupon,
  type CouponInput,
  type StatedRanges,
} from '@beadroll/rules';
import { refreshContinuityPairs } from '../continuity/continuity-state.repository.js';
import { recordLapseMoves } from '../lapse-watch/lapse-events.js';
import { userName } from '../qualifications/qualifications.repository.js';
import { CODE_NAMES } from '../documents/document-format.js';
import { dateHint, parseDay } from './cells.js';
import {
  batches,
  breathe,
  Columns,
  Findings,
  shopsByCodeOrName,
  type FieldDef,
  type ImportPlan,
  type KindDef,
  type PlanContext,
  type Tick,
  weldersByStamp,
} from './import-plan.js';

const fields: FieldDef[] = [
  { key: 'stamp', label: 'Stamp', required: true, hint: 'The welder’s stamp', aliases: ['welder stamp', 'welder', 'stamp no', 'welder id'] },
  { key: 'code', label: 'Code', required: true, hint: 'ASME IX, AWS D1.1, API 1104 or ISO 9606-1', aliases: ['standard', 'code of construction', 'qualification code'] },
  { key: 'process', label: 'Process', required: true, hint: 'SMAW, GTAW, GMAW, FCAW, SAW, PAW or OFW', aliases: ['welding process', 'proc'] },
  { key: 'testedOn', label: 'Test date', required: true, hint: 'The day the coupon was welded', aliases: ['date tested', 'test date', 'date of test', 'tested'] },
  { key: 'wps', label: 'WPS', required: true, hint: 'The WPS number of the test, from your register', aliases: ['wps no', 'wps number', 'procedure'] },
  { key: 'wpsRevision', label: 'WPS revision', required: false, hint: 'Default: the active revision', aliases: ['rev', 'revision', 'wps rev'] },
  { key: 'shop', label: 'Shop', required: false, hint: 'Where it was tested (default: the welder’s home shop)', aliases: ['location', 'shop code'] },
  { key: 'form', label: 'Plate or pipe', required: true, hint: 'plate or pipe', aliases: ['form', 'product form', 'coupon form', 'type'] },
  { key: 'weld', label: 'Groove or fillet', required: true, hint: 'groove or fillet', aliases: ['weld', 'weld type', 'joint'] },
  { key: 'position', label: 'Test position', required: true, hint: '1G … 6G, 6GR, 1F … 4F, 3G+4G', aliases: ['position', 'pos'] },
  { key: 'thickness', label: 'Thickness', required: false, hint: 'Coupon thickness or pipe wall: 3/8, 1/2 in, 10 mm (or NPS + schedule)', aliases: ['coupon thickness', 'wall', 'wall thickness', 't'] },
  { key: 'nps', label: 'NPS', required: false, hint: 'Pipe size, with the schedule', aliases: ['pipe size', 'nominal pipe size'] },
  { key: 'schedule', label: 'Schedule', required: false, hint: 'Sch 40, 80, XS …', aliases: ['sch', 'pipe schedule'] },
  { key: 'outsideDiameter', label: 'Outside diameter', required: false, hint: 'Pipe OD: 6.625 in, 168 mm', aliases: ['od', 'pipe od', 'diameter'] },
  { key: 'depositedThickness', label: 'Deposited thickness', required: false, hint: 'Weld metal this welder deposited (default: the thickness)', aliases: ['deposit', 'weld metal thickness', 'deposited'] },
  { key: 'layers', label: 'Layers', required: false, hint: 'Number of layers', aliases: ['passes', 'no of layers'] },
  { key: 'backing', label: 'Backing', required: true, hint: 'yes or no', aliases: ['with backing', 'backing used'] },
  { key: 'fNumber', label: 'F-No.', required: false, hint: 'The filler metal’s F-Number', aliases: ['f number', 'f-number', 'fno', 'filler f-no'] },
  { key: 'transferMode', label: 'Transfer mode', required: false, hint: 'GMAW: spray, globular, pulse or short-circuit', aliases: ['transfer', 'mode'] },
  { key: 'progression', label: 'Progression', required: false, hint: 'uphill or downhill', aliases: ['vertical progression', 'direction'] },
  { key: 'examination', label: 'Examination', required: false, hint: 'As the paper names it: bends, RT, UT …', aliases: ['test type', 'examination method', 'tests'] },
  { key: 'examiner', label: 'Examiner', required: false, hint: 'Who examined the coupon', aliases: ['examined by', 'inspector', 'witness'] },
  { key: 'labReport', label: 'Lab report', required: false, hint: 'Report number', aliases: ['report', 'lab report no', 'report number'] },
  { key: 'certifiedOn', label: 'Certified on', required: false, hint: 'Default: the test date', aliases: ['date certified', 'certification date', 'certified'] },
  { key: 'certifiedBy', label: 'Certified by', required: false, hint: 'Who signed the paper WPQ (default: you)', aliases: ['signed by', 'certifier'] },
  { key: 'groovePositions', label: 'Paper: groove positions', required: false, hint: 'As the record states them: F, H, V, O or all', aliases: ['positions qualified', 'groove positions', 'qualified positions'] },
  { key: 'filletPositions', label: 'Paper: fillet positions', required: false, hint: 'As the record states them', aliases: ['fillet positions qualified', 'fillet positions'] },
  { key: 'thicknessRange', label: 'Paper: thickness range', required: false, hint: '1/8 to 3/4 in, up to 3/4 in, unlimited', aliases: ['thickness qualified', 'thickness range'] },
  { key: 'diameterRange', label: 'Paper: diameter range', required: false, hint: '2-7/8 in and over', aliases: ['diameter qualified', 'diameter range', 'od qualified'] },
  { key: 'fNumbersRange', label: 'Paper: F-Nos.', required: false, hint: '1-4, F4 and below', aliases: ['f-no qualified', 'f numbers qualified'] },
];
const statedKey: Record<(typeof statedRangeVariables)[number], string> = {
  groovePositions: 'groovePositions',
  filletPositions: 'filletPositions',
  thickness: 'thicknessRange',
  diameter: 'diameterRange',
  fNumbers: 'fNumbersRange',
};

const squash = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');
const CODE_WORDS: Record<string, CodeId> = {
  asmeix: 'asme-ix', asmesectionix: 'asme-ix', asmebpvcix: 'asme-ix', asmebpvcsectionix: 'asme-ix', ix: 'asme-ix', sectionix: 'asme-ix',
  awsd11: 'aws-d1.1', d11: 'aws-d1.1',
  api1104: 'api-1104',
  iso96061: 'iso-9606-1', en96061: 'iso-9606-1', eniso96061: 'iso-9606-1',
};
for (const id of codeIds) CODE_WORDS[squash(id)] = id;

const YES = new Set(['yes', 'y', 'true', '1', 'with', 'with backing', 'backed', 'x']);
const NO = new Set(['no', 'n', 'false', '0', 'without', 'without backing', 'none', 'open root', 'open']);
const TRANSFER: Record<string, Coupon['transferMode']> = {
  spray: 'spray', globular: 'globular', pulse: 'pulse', pulsed: 'pulse', shortcircuit: 'short-circuit', short: 'short-circuit', gmaws: 'short-circuit', sc: 'short-circuit',
};
const PROGRESSION: Record<string, Coupon['progression']> = {
  uphill: 'uphill', up: 'uphill', verticalup: 'uphill', downhill: 'downhill', down: 'downhill', verticaldown: 'downhill',
};

/** The coupon as the paper states it, checked like the coupon form; problems by field key. */
function readCoupon(get: (k: string) => string, code: CodeId | undefined, process: string): { coupon?: CouponInput; pipe: { nps: string; schedule: string } | null; problems: [string, string][] } {
  const problems: [string, string][] = [];
  const len = (k: string): { value: number; unit: 'in' | 'mm' } | undefined => {
    const t = get(k);
    if (!t) return undefined;
    try {
      const p = parseLength(t);
      return { value: p.value, unit: p.unit };
    } catch (e) {
      problems.push([k, e instanceof RulesInputError ? Object.values(e.fields)[0] ?? 'Not a length' : 'Not a length']);
      return undefined;
    }
  };
  let thickness = len('thickness');
  let outsideDiameter = len('outsideDiameter');
  let pipe: { nps: string; schedule: string } | null = null;
  if (get('nps') || get('schedule')) {
    try {
      const d = pipeDimensions(get('nps'), get('schedule'));
      pipe = { nps: get('nps'), schedule: get('schedule') };
      thickness ??= d.wall;
      outsideDiameter ??= d.outsideDiameter;
    } catch (e) {
      const f = e instanceof RulesInputError ? e.fields : {};
      problems.push([f.nps ? 'nps' : 'schedule', Object.values(f)[0] ?? 'Not a pipe size Beadroll lists']);
    }
  }
  if (!get('thickness') && !pipe && !get('nps') && !get('schedule')) problems.push(['thickness', 'Give the thickness (or NPS and schedule)']);
  const backingText = get('backing').toLowerCase();
  const backing = YES.has(backingText) ? true : NO.has(backingText) ? false : undefined;
  if (backingText && backing === undefined) problems.push(['backing', `“${get('backing')}”: write yes or no`]);
  const fText = get('fNumber').replace(/^f-?(no\.?)?\s*/i, '');
  const fNumber = fText ? Number(fText) : undefined;
  const transferText = squash(get('transferMode'));
  const transferMode = transferText ? TRANSFER[transferText] : undefined;
  if (transferText && !transferMode) problems.push(['transferMode', `“${get('transferMode')}”: write spray, globular, pulse or short-circuit`]);
  const progressionText = squash(get('progression'));
  const progression = progressionText ? PROGRESSION[progressionText] : undefined;
  if (progressionText && !progression) problems.push(['progression', `“${get('progression')}”: write uphill or downhill`]);
  const layersText = get('layers');
  const input = {
    code,
    process,
    form: get('form').toLowerCase(),
    weld: get('weld').toLowerCase(),
    position: get('position'),
    thickness,
    backing,
    ...(fNumber !== undefined ? { fNumber } : {}),
    ...(transferMode ? { transferMode } : {}),
    ...(progression ? { progression } : {}),
    ...(outsideDiameter ? { outsideDiameter } : {}),
    ...(len('depositedThickness') ? { depositedThickness: len('depositedThickness') } : {}),
    ...(layersText ? { layers: Number(layersText) } : {}),
  };
  const parsed = couponSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = String(issue.path[0] ?? '');
      if (key === 'code' || key === 'process') continue; // reported on their own columns
      if (key === 'thickness' && problems.some(([k]) => k === 'thickness' || k === 'nps' || k === 'schedule')) continue;
      if (key === 'backing' && backingText) continue;
      problems.push([key, key === 'backing' && !backingText ? 'Required: yes or no' : issue.message]);
    }
    return { pipe, problems };
  }
  return { coupon: input as CouponInput, pipe, problems };
}

/** JSON with sorted keys: the same coupon read twice compares equal. */
const stable = (v: unknown): string =>
  JSON.stringify(v, (_k, x: unknown) =>
    x && typeof x === 'object' && !Array.isArray(x)
      ? Object.fromEntries(Object.entries(x as Record<string, unknown>).sort(([a], [b]) => a.localeCompare(b)))
      : x,
  );

interface Row {
  line: number;
  welderId: string;
  shopId: string;
  procedureId: string;
  testedOn: string;
  certifiedOn: string;
  certifiedByName: string;
  coupon: Coupon;
  pipe: { nps: string; schedule: string } | null;
  examiner: string;
  labReport: string;
  examination: string;
  stated: StatedRanges;
  ranges: ReturnType<typeof qualifiedRanges>;
  differences: ReturnType<typeof rangeDifferences>;
}

interface Existing {
  qualificationId: string;
  key: string;
  coupon: object;
  stated: StatedRanges | null;
  settledOn: string | null;
}

async function plan(ctx: PlanContext): Promise<ImportPlan> {
  const { db, actor, sheet } = ctx;
  const cols = new Columns(fields, ctx);
  const findings = new Findings();
  const shopByKey = await shopsByCodeOrName(db, actor.organizationId);
  const welders = await weldersByStamp(db, actor.organizationId);
  const procedures = await db.query<{ id: string; number: string; revision: string; code: string; processes: string[]; status: string }[]>(
    `SELECT id, number, revision, code, processes, status FROM procedures WHERE organization_id = $1 ORDER BY status = 'active' DESC, created_at DESC`,
    [actor.organizationId],
  );
  const existing = new Map(
    (
      await db.query<Existing[]>(
        `SELECT q.id AS "qualificationId", q.welder_id || '|' || q.code || '|' || q.process || '|' || to_char(c.tested_on, 'YYYY-MM-DD') AS key,
                c.coupon, p.stated, to_char(p.settled_at, 'YYYY-MM-DD') AS "settledOn"
           FROM qualifications q JOIN coupons c ON c.id = q.coupon_id
           LEFT JOIN qualification_paper_records p ON p.qualification_id = q.id
          WHERE q.organization_id = $1`,
        [actor.organizationId],
      )
    ).map((e) => [e.key, e]),
  );
  const myName = await userName(db, actor.id);

  const inserts: Row[] = [];
  const restated: (Row & { qualificationId: string })[] = [];
  const seen = new Map<string, number>();
  for (const [i, row] of sheet.rows.entries()) {
    if (i % 500 === 499) await breathe();
    const get = (k: string) => cols.get(row, k).trim();
    const problem = (k: string, message: string) => findings.add(row.line, cols.header(k), message);
    for (const f of fields) if (f.required && cols.has(f.key) && !get(f.key)) problem(f.key, 'Required');

    const stamp = get('stamp').toUpperCase();
    const welder = welders.get(stamp);
    if (stamp && !welder) problem('stamp', `No welder with stamp ${stamp} in your company; import or add the welder first`);
    const code = CODE_WORDS[squash(get('code'))];
    if (get('code') && !code) problem('code', `“${get('code')}” is not a code Beadroll knows: ASME IX, AWS D1.1, API 1104 or ISO 9606-1`);
    const process = get('process').toUpperCase();
    if (process && !(processes as readonly string[]).includes(process)) problem('process', `Process must be one of ${processes.join(', ')}`);
    const day = (k: string) => {
      const t = get(k);
      if (!t) return null;
      const d = parseDay(t, ctx.dateFormat);
      if (!d) problem(k, `“${t}” is not a date as ${dateHint[ctx.dateFormat]}`);
      else if (d > ctx.today) problem(k, `${d} is in the future`);
      return d;
    };
    const testedOn = day('testedOn');
    const certifiedOn = day('certifiedOn') ?? testedOn;
    if (testedOn && certifiedOn && certifiedOn < testedOn) problem('certifiedOn', `Certification cannot be before the test (${testedOn})`);

    const shopText = get('shop');
    const shopId = shopText ? shopByKey.get(shopText.toLowerCase())?.id : welder?.homeShopId;
    if (shopText && !shopId) problem('shop', `No shop “${shopText}” in your company`);

    const wps = get('wps');
    const rev = get('wpsRevision');
    const procedure = procedures.find((p) => p.number.toLowerCase() === wps.toLowerCase() && (!rev || p.revision.toLowerCase() === rev.toLowerCase()));
    if (wps && !procedure) problem(rev ? 'wpsRevision' : 'wps', `No WPS ${wps}${rev ? ` rev ${rev}` : ''} in your register; add it on the Procedures screen first`);
    // A historical test was welded to the revision in force then: a superseded WPS is accepted here.
    else if (procedure && code && procedure.code !== code)
      problem('wps', `WPS ${procedure.number} rev ${procedure.revision} is for ${CODE_NAMES[procedure.code as CodeId] ?? procedure.code}, not ${CODE_NAMES[code]}`);
    else if (procedure && process && !procedure.processes.includes(process)) problem('wps', `WPS ${procedure.number} rev ${procedure.revision} does not cover ${process}`);

    const read = readCoupon(get, code, process);
    for (const [k, message] of read.problems) problem(cols.has(k) ? k : k === 'thickness' && cols.has('nps') ? 'nps' : k, message);
    let ranges: Row['ranges'] | null = null;
    if (read.coupon && !findings.has(row.line)) {
      try {
        ranges = qualifiedRanges(read.coupon);
      } catch (e) {
        if (!(e instanceof RulesInputError)) throw e;
        for (const [k, message] of Object.entries(e.fields)) problem(cols.has(k) ? k : 'position', message);
      }
    }
    const stated: StatedRanges = {};
    for (const v of statedRangeVariables) if (get(statedKey[v])) stated[v] = get(statedKey[v]);
    for (const v of statedRangeVariables)
      try {
        parseStatedRanges({ [v]: stated[v] });
      } catch (e) {
        if (!(e instanceof RulesInputError)) throw e;
        problem(statedKey[v], Object.values(e.fields)[0] ?? 'Not readable');
      }
    const differences = ranges && !findings.has(row.line) ? rangeDifferences(ranges, stated) : [];
    if (findings.has(row.line) || !welder || !code || !testedOn || !certifiedOn || !shopId || !procedure || !ranges || !read.coupon) continue;

    const key = `${welder.id}|${code}|${process}|${testedOn}`;
    const dup = seen.get(key);
    if (dup !== undefined) {
      findings.add(row.line, null, `${stamp} ${process} ${get('code')} tested ${testedOn} is already on row ${dup} of this file`);
      continue;
    }
    seen.set(key, row.line);
    const coupon = couponSchema.parse(read.coupon);
    const r: Row = {
      line: row.line,
      welderId: welder.id,
      shopId,
      procedureId: procedure.id,
      testedOn,
      certifiedOn,
      certifiedByName: get('certifiedBy') || myName,
      coupon,
      pipe: read.pipe,
      examiner: get('examiner'),
      labReport: get('labReport'),
      examination: get('examination'),
      stated,
      ranges,
      differences,
    };
    const old = existing.get(key);
    if (!old) {
      findings.counts.new++;
      inserts.push(r);
    } else if (stable(old.coupon) !== stable(coupon)) {
      findings.add(
        row.line,
        null,
        `${stamp} ${process} tested ${testedOn} is already on record with other coupon variables; certified records are never edited — record the correction on the Coupons screen`,
      );
    } else if (stable(old.stated ?? {}) === stable(stated)) {
      findings.counts.unchanged++;
    } else if (old.settledOn) {
      findings.add(
        row.line,
        null,
        `The paper ranges of ${stamp} ${process} tested ${testedOn} were settled on ${old.settledOn}; an import does not reopen a settled record`,
      );
    } else {
      const text = (s: StatedRanges) => Object.fromEntries(statedRangeVariables.map((v) => [v, s[v] ?? '']));
      findings.change(row.line, `${stamp} ${process} ${testedOn}`, text(old.stated ?? {}), text(stated));
      restated.push({ ...r, qualificationId: old.qualificationId });
    }
  }
  for (const m of cols.missing()) findings.add(1, null, `Choose the column that holds “${m}”`);
  const differing = [...inserts, ...restated].filter((r) => r.differences.length > 0).length;
  if (differing > 0)
    findings.notes.push(
      `${differing} qualification(s) state ranges other than the rules compute from their coupon; both are kept, and each waits on the Imports screen for you to settle.`,
    );

  return {
    report: findings.report(sheet.rows.length),
    async apply(db, tick: Tick) {
      const total = inserts.length + restated.length;
      let done = 0;
      const at = ctx.clock.now();
      for (const b of batches(inserts, 1000)) {
        const couponIds = b.map(() => randomUUID());
        const qualificationIds = b.map(() => randomUUID());
        await db.query(
          `INSERT INTO coupons (id, organization_id, welder_id, shop_id, procedure_id, tested_on, code, process, coupon, pipe,
                                examiner, lab_report_number, visual, examination, result, reasons, rules_version, notes, recorded_by, created_at, updated_at)
           SELECT u.id, $1, u.welder_id, u.shop_id, u.procedure_id, u.tested_on, u.coupon->>'code', u.coupon->>'process', u.coupon, u.pipe,
                  jsonb_build_object('name', u.examiner, 'certificateNumber', ''), u.lab_report, 'accept',
                  jsonb_build_object('visual', jsonb_build_object('result', 'accept')), 'accept', '[]', $2, u.notes, $3, $4, $4
             FROM unnest($5::uuid[], $6::uuid[], $7::uuid[], $8::uuid[], $9::date[], $10::jsonb[], $11::jsonb[], $12::text[], $13::text[], $14::text[])
                  AS u(id, welder_id, shop_id, procedure_id, tested_on, coupon, pipe, examiner, lab_report, notes)`,
          [
            actor.organizationId,
            RULES_VERSION,
            actor.id,
            at,
            couponIds,
            b.map((r) => r.welderId),
            b.map((r) => r.shopId),
            b.map((r) => r.procedureId),
            b.map((r) => r.testedOn),
            b.map((r) => JSON.stringify(r.coupon)),
            b.map((r) => (r.pipe ? JSON.stringify(r.pipe) : null)),
            b.map((r) => r.examiner || 'as the paper record states'),
            b.map((r) => r.labReport),
            b.map(
              (r) =>
                `Imported from a paper WPQ (row ${r.line}); passed as the record states${r.examination ? `, examination: ${r.examination}` : ''}. The specimens were judged on paper, not in Beadroll.`,
            ),
          ],
        );
        await db.query(
          `INSERT INTO qualifications (id, organization_id, welder_id, coupon_id, code, process, transfer_mode, progression, ranges,
                                       certified_on, certified_by, certified_by_name, rules_version, created_at, updated_at)
           SELECT u.id, $1, u.welder_id, u.coupon_id, u.code, u.process, u.transfer_mode, u.progression, u.ranges,
                  u.certified_on, $2, u.certified_by_name, $3, $4, $4
             FROM unnest($5::uuid[], $6::uuid[], $7::uuid[], $8::text[], $9::text[], $10::text[], $11::text[], $12::jsonb[], $13::date[], $14::text[])
                  AS u(id, welder_id, coupon_id, code, process, transfer_mode, progression, ranges, certified_on, certified_by_name)`,
          [
            actor.organizationId,
            actor.id,
            RULES_VERSION,
            at,
            qualificationIds,
            b.map((r) => r.welderId),
            couponIds,
            b.map((r) => r.coupon.code),
            b.map((r) => r.coupon.process),
            b.map((r) => r.coupon.transferMode ?? null),
            b.map((r) => r.coupon.progression ?? null),
            b.map((r) => JSON.stringify(r.ranges)),
            b.map((r) => r.certifiedOn),
            b.map((r) => r.certifiedByName),
          ],
        );
        await writePaperRecords(db, qualificationIds, b);
        done += b.length;
        await tick('writing', done, total);
      }
      for (const b of batches(restated, 1000)) {
        await writePaperRecords(db, b.map((r) => r.qualificationId), b);
        done += b.length;
        await tick('writing', done, total);
      }
      // Continuity of every touched (welder, process), refreshed once, set-based; lapse notices it moves.
      await tick('refreshing continuity', done, total);
      const pairs = inserts.map((r) => ({ welderId: r.welderId, process: r.coupon.process }));
      await recordLapseMoves(db, await refreshContinuityPairs(db, pairs), ctx.clock);
      return { added: inserts.length, restated: restated.length, differing };
    },
  };

  async function writePaperRecords(db: PlanContext['db'], qualificationIds: string[], b: Row[]) {
    // Only an unsettled record is re-stated (the plan refuses the others).
    await db.query(
      `INSERT INTO qualification_paper_records AS p (qualification_id, organization_id, import_id, line, stated, differences, computed_ranges)
       SELECT u.id, $1, $2, u.line, u.stated, u.differences, u.ranges
         FROM unnest($3::uuid[], $4::int[], $5::jsonb[], $6::jsonb[], $7::jsonb[]) AS u(id, line, stated, differences, ranges)
       ON CONFLICT (qualification_id) DO UPDATE
          SET import_id = EXCLUDED.import_id, line = EXCLUDED.line, stated = EXCLUDED.stated, differences = EXCLUDED.differences
        WHERE p.settled_at IS NULL`,
      [
        actor.organizationId,
        ctx.importId,
        qualificationIds,
        b.map((r) => r.line),
        b.map((r) => JSON.stringify(r.stated)),
        b.map((r) => JSON.stringify(r.differences)),
        b.map((r) => JSON.stringify(r.ranges)),
      ],
    );
  }
}

export const qualificationsImport: KindDef = { fields, plan };
