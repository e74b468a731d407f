// The coupon form's live computation in the browser: lengths read as typed, pipe OD and wall from NPS and
// schedule, and the verdict panel following the discontinuities. Pure rules; no server is involved.
import type { Procedure, RecordedExaminationInput, Welder } from '@beadroll/rules';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useState } from 'react';
import { MemoryRouter } from 'react-router-dom';
import { describe, expect, it, vi } from 'vitest';
import { SizeField } from '@/components/ui/size-field';
import { analyseDraft, emptyDraft, newDiscontinuity, newFinding, newIndication, newLayer, newNickBreak, newSpecimen, toRecordInput, type CouponDraft, type RetestTarget } from '../model/coupon-draft';
import { CouponForm } from './coupon-form';
import { PipeSizeFields } from './pipe-size-fields';
import { VerdictPanel } from './verdict-panel';

const welderId = '7b0c7f3e-2b7a-4d37-9b8e-2a4f1e0c9d11';
const shopId = '0f3c9a52-6f1e-4b0a-8d55-3c1e2f9a7b10';
const procedureId = '5a1d2c3b-4e5f-4a6b-8c7d-9e0f1a2b3c4d';

/** A 3/8 in ASME IX plate in 3G with one side bend carrying the given sizes (all on its surface). */
function draftWith(sizes: string[], over: Partial<CouponDraft> = {}): CouponDraft {
  const specimen = { ...newSpecimen('side'), examined: true };
  specimen.discontinuities = sizes.map((sizeText) => ({ ...newDiscontinuity(), sizeText }));
  return {
    ...emptyDraft({ welderId, shopId, code: 'asme-ix', process: 'SMAW', position: '3G' }),
    procedureId,
    thicknessText: '3/8',
    backing: 'with',
    fNumberText: '4',
    progression: 'uphill',
    examinerName: 'Test Examiner',
    visual: 'accept',
    specimensChosen: true,
    specimens: [specimen, { ...newSpecimen('side'), examined: true }],
    ...over,
  };
}

describe('the live verdict', () => {
  it('accepts 1/16 and 1/32 on one specimen and rejects when a 3/16 joins them (ASME IX QW-163: over 1/8 in rejects; published, read second-hand)', () => {
    const ok = analyseDraft(draftWith(['1/16', '1/32']));
    expect(ok.verdict).toBe('accept');
    expect(ok.reasons).toEqual([]);

    const bad = analyseDraft(draftWith(['1/16', '1/32', '3/16']));
    expect(bad.verdict).toBe('reject');
    expect(bad.reasons).toHaveLength(1);
    expect(bad.reasons[0]).toMatchObject({ clause: 'ASME IX QW-163', where: 'Specimen 1 (side)' });
    expect(bad.reasons[0]?.message).toContain('measured 3/16 in, allowed 1/8 in');

    render(<VerdictPanel analysis={bad} />);
    const panel = screen.getByRole('region', { name: 'Evaluation' });
    expect(panel.getAttribute('aria-live')).toBe('polite');
    expect(within(panel).getByText('Reject').closest('[data-tone]')?.getAttribute('data-tone')).toBe('bad');
    expect(within(panel).getByText(/Specimen 1 \(side\):/)).toBeTruthy();
    expect(within(panel).getByText('ASME IX QW-163')).toBeTruthy();
    expect(within(panel).getByText(/responsible inspector govern/)).toBeTruthy();
  });

  it('passes a size exactly at the limit (1/8 in, ASME IX QW-163) and a corner crack without a fusion cause is only noted', () => {
    const at = analyseDraft(draftWith(['1/8']));
    expect(at.verdict).toBe('accept');
    const corner = draftWith([]);
    const first = corner.specimens[0];
    if (first) first.discontinuities = [{ ...newDiscontinuity(), sizeText: '3/16', location: 'corner', type: 'crack' }];
    const a = analyseDraft(corner);
    expect(a.verdict).toBe('accept');
    expect(a.notes.some((n) => /not considered/.test(n.message))).toBe(true);
  });

  it('a rejected visual examination rejects the coupon whatever the bends show', () => {
    const a = analyseDraft(draftWith(['1/16'], { visual: 'reject' }));
    expect(a.verdict).toBe('reject');
    // from memory: ASME IX QW-302.4, QW-194 (the visual examination comes first; a reject stops the test)
    expect(a.reasons[0]).toMatchObject({ clause: 'QW-302.4, QW-194', message: 'The examiner rejected the weld on visual examination.' });
    expect(a.evaluation?.parts.map((p) => p.kind)).toEqual(['visual']);
  });

  it('AWS D1.1 caps the sum on one specimen at 3/8 in: three 1/8 in pass, a fourth of 1/16 in rejects (from memory: AWS D1.1 4.9.3.3)', () => {
    const three = analyseDraft(draftWith(['1/8', '1/8', '1/8'], { code: 'aws-d1.1', criteria: 'aws-d1.1' }));
    expect(three.verdict).toBe('accept');
    const four = analyseDraft(draftWith(['1/8', '1/8', '1/8', '1/16'], { code: 'aws-d1.1', criteria: 'aws-d1.1' }));
    expect(four.verdict).toBe('reject');
    expect(four.reasons[0]?.message).toMatch(/add up to more than allowed/);
  });

  it('says what is missing instead of a verdict while a size does not read, and sends the live verdict as claimedResult', () => {
    const unreadable = analyseDraft(draftWith(['1/16', '3/']));
    expect(unreadable.verdict).toBeNull();
    expect(unreadable.errors['examination.bend.specimens.0.discontinuities.1.sizeText']).toMatch(/"3\/" is not a length/);

    const d = draftWith(['1/16', '1/32', '3/16']);
    const { input, errors } = toRecordInput(d, analyseDraft(d));
    expect(errors).toEqual({});
    expect(input?.claimedResult).toBe('reject');
    const sent = (input?.examination as RecordedExaminationInput | undefined)?.bend?.specimens[0]?.discontinuities?.[2];
    expect(sent).toMatchObject({ sizeText: '3/16', size: { value: 0.1875, unit: 'in' }, location: 'surface' });
  });

  it('shows the qualified ranges preview with its clauses, and a rules error at the named field', () => {
    const a = analyseDraft(draftWith(['1/16']));
    expect(a.ranges?.positions.groove).toEqual(['F', 'V']);
    expect(a.ranges?.limits.some((l) => l.clause === 'QW-461.9')).toBe(true);
    const noProgression = analyseDraft(draftWith(['1/16'], { progression: '' }));
    expect(noProgression.ranges).toBeNull();
    expect(noProgression.errors['coupon.progression']).toMatch(/uphill or downhill/);
  });
});

function SizeHarness() {
  const [text, setText] = useState('');
  return <SizeField label="Size" value={text} onChange={setText} />;
}

describe('the size field', { timeout: 30_000 }, () => {
  it('reads fractions, mixed numbers and millimetres as they are typed, and names what does not read', async () => {
    const user = userEvent.setup();
    render(<SizeHarness />);
    const input = screen.getByLabelText('Size');
    await user.type(input, '3/16');
    // 3/16 in = 4.7625 mm (1 in = 25.4 mm exactly, the international inch: NIST SP 811)
    expect(screen.getByText('Reads as 3/16 in (4.76 mm)')).toBeTruthy();
    await user.clear(input);
    await user.type(input, '1-1/4 in');
    expect(screen.getByText('Reads as 1-1/4 in (31.75 mm)')).toBeTruthy();
    await user.clear(input);
    await user.type(input, '4 mm');
    expect(screen.getByText('Reads as 4 mm (0.157 in)')).toBeTruthy();
    await user.clear(input);
    await user.type(input, '3/0');
    expect(screen.getByText(/zero denominator/)).toBeTruthy();
    expect(input.getAttribute('aria-invalid')).toBe('true');
    await user.clear(input);
    await user.type(input, '4 cm');
    expect(screen.getByText(/"cm" is not a unit/)).toBeTruthy();
  });
});

function PipeHarness() {
  const [v, setV] = useState({ nps: '', schedule: '' });
  return <PipeSizeFields nps={v.nps} schedule={v.schedule} errors={{}} onChange={(c) => setV((x) => ({ ...x, ...c }))} />;
}

describe('pipe by NPS and schedule', { timeout: 30_000 }, () => {
  it('fills OD 2.375 in and wall 0.218 in for NPS 2 Sch 80 (ASME B36.10M; the values TRADE.md §7 lists)', async () => {
    const user = userEvent.setup();
    render(<PipeHarness />);
    await user.type(screen.getByLabelText('NPS'), '2');
    await user.type(screen.getByLabelText('Schedule'), '80');
    const out = screen.getByLabelText('Pipe dimensions');
    expect(out.textContent).toContain('2-3/8 in (60.33 mm)');
    expect(out.textContent).toContain('0.218 in (5.54 mm)');
    await user.clear(screen.getByLabelText('Schedule'));
    await user.type(screen.getByLabelText('Schedule'), '120');
    expect(screen.getByText(/defines no schedule 120 for NPS 2/)).toBeTruthy();
  });
});

const welder: Welder = {
  id: welderId,
  stamp: 'PV-07',
  name: 'Test Welder',
  homeShop: { id: shopId, code: 'PV', name: 'Test Bay' },
  email: '',
  active: true,
  hasAccount: false,
  version: 1,
  createdAt: '2026-01-05T10:00:00.000Z',
};

// Typing in a rendered form is slow on a shared machine: these get more than the 5 s default.
describe('the coupon form', { timeout: 30_000 }, () => {
  it('proposes the bend specimens from the thickness and turns the verdict to Reject as a third discontinuity is typed', async () => {
    const user = userEvent.setup();
    const client = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
    render(
      <QueryClientProvider client={client}>
        <CouponForm
          welders={[welder]}
          shops={[welder.homeShop]}
          procedures={[]}
          prefill={{ welderId, code: 'asme-ix', process: 'SMAW', position: '1G' }}
          onSaved={vi.fn()}
          onCancel={vi.fn()}
        />
      </QueryClientProvider>,
    );
    expect(screen.getByLabelText<HTMLSelectElement>('Shop').value).toBe(shopId);
    await user.selectOptions(screen.getByLabelText('Backing'), 'without');
    await user.type(screen.getByLabelText('Coupon thickness'), '1/4');
    // Under 3/8 in deposited: one face and one root bend (ASME IX QW-452.1(a); published, read second-hand).
    expect(screen.getByRole('group', { name: 'Specimen 1 (face)' })).toBeTruthy();
    expect(screen.getByRole('group', { name: 'Specimen 2 (root)' })).toBeTruthy();
    const panel = screen.getByRole('region', { name: 'Evaluation' });
    // Nothing is judged before it is examined: visual first, then each specimen.
    expect(within(panel).getByText('Not yet examined')).toBeTruthy();
    expect(within(panel).queryByText('Accept')).toBeNull();
    await user.selectOptions(screen.getByLabelText('Visual examination'), 'accept');
    expect(within(panel).getByText(/Specimen 1 \(face\) is not/)).toBeTruthy();
    await user.click(screen.getByRole('checkbox', { name: 'Specimen 1 (face) examined' }));
    expect(within(panel).getByText(/Specimen 2 \(root\) is not/)).toBeTruthy();
    await user.click(screen.getByRole('checkbox', { name: 'Specimen 2 (root) examined' }));
    expect(within(panel).getByText('Accept')).toBeTruthy();

    await user.click(screen.getByRole('button', { name: 'Add a discontinuity to Specimen 2 (root)' }));
    await user.type(screen.getByLabelText('Size of Specimen 2 (root), discontinuity 1'), '1/16{Enter}');
    await user.keyboard('1/32');
    expect(within(panel).getByText('Accept')).toBeTruthy();
    await user.keyboard('{Enter}3/16');
    expect(within(panel).getByText('Reject')).toBeTruthy();
    expect(within(panel).getByText(/Specimen 2 \(root\):/)).toBeTruthy();
    await user.click(screen.getByRole('button', { name: 'Remove Specimen 2 (root), discontinuity 3' }));
    expect(within(panel).getByText('Accept')).toBeTruthy();
  });
});

function renderForm(prefill: Parameters<typeof CouponForm>[0]['prefill'], procedures: Parameters<typeof CouponForm>[0]['procedures'] = []) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  return render(
    <QueryClientProvider client={client}>
      <CouponForm welders={[welder]} shops={[welder.homeShop]} procedures={procedures} prefill={prefill} onSaved={vi.fn()} onCancel={vi.fn()} />
    </QueryClientProvider>,
  );
}

describe('implausible sizes (common practice (no source): typing slips, refused as the API refuses them)', { timeout: 30_000 }, () => {
  it('refuses a thickness of 99999999 or 0 and a 400 mm deposit at the named field, and lists them on save', async () => {
    const user = userEvent.setup();
    renderForm({ welderId, code: 'asme-ix', process: 'SMAW', position: '1G' });
    const thickness = screen.getByLabelText('Coupon thickness');
    await user.type(thickness, '99999999');
    expect(screen.getByText('The coupon thickness of 99999999 in is not a plausible size: enter 0.01 in to 12 in')).toBeTruthy();
    expect(thickness.getAttribute('aria-invalid')).toBe('true');
    await user.clear(thickness);
    await user.type(thickness, '0');
    expect(screen.getByText(/The coupon thickness of 0 in is not a plausible size/)).toBeTruthy();
    await user.clear(thickness);
    await user.type(thickness, '3/8');
    expect(thickness.getAttribute('aria-invalid')).not.toBe('true');

    await user.type(screen.getByLabelText('Deposited weld metal thickness'), '400 mm');
    expect(screen.getByText(/deposited weld metal thickness of 400 mm is not a plausible size: enter 0.25 mm to 300 mm/)).toBeTruthy();
    await user.click(screen.getByRole('button', { name: 'Save coupon' }));
    const summary = screen.getByText('Deposited thickness:').closest('li');
    expect(summary?.textContent).toMatch(/not a plausible size/);
  });

  it('reads the same bounds in the model the form sends: a zero-size discontinuity has no verdict and is named', () => {
    const a = analyseDraft(draftWith(['0']));
    expect(a.verdict).toBeNull();
    expect(a.errors['examination.bend.specimens.0.discontinuities.0.sizeText']).toMatch(/A discontinuity of 0 in is not a plausible size/);
  });
});

const procedure = (over: Partial<Procedure> = {}): Procedure => ({
  id: procedureId,
  number: 'HB-S12',
  revision: '2',
  code: 'asme-ix',
  processes: ['SMAW'],
  pNumbers: ['1', '1'],
  fNumber: 4,
  positions: [],
  thicknessMin: null,
  thicknessMax: null,
  status: 'active',
  document: null,
  notes: '',
  version: 1,
  createdAt: '2026-01-05T10:00:00.000Z',
  ...over,
});

describe('the coupon form offers what fits the coupon', { timeout: 30_000 }, () => {
  it('fills the base metal P-Nos. and the F-No. from the WPS chosen', async () => {
    const user = userEvent.setup();
    renderForm({ welderId, code: 'asme-ix', process: 'SMAW' }, [procedure(), procedure({ id: 'c2b1a0f9-8e7d-4c6b-9a5f-4e3d2c1b0a99', number: 'HB-S20', pNumbers: ['8', '1'], fNumber: 5 })]);
    await user.selectOptions(screen.getByLabelText('WPS'), 'HB-S12 rev 2');
    expect(screen.getByLabelText<HTMLInputElement>('Base metal P-Nos.').value).toBe('1, 1');
    expect(screen.getByLabelText<HTMLInputElement>('F-No.').value).toBe('4');
    expect(screen.getByText('Filled from WPS HB-S12; change it if the coupon differs.')).toBeTruthy();
    await user.selectOptions(screen.getByLabelText('WPS'), 'HB-S20 rev 2');
    expect(screen.getByLabelText<HTMLInputElement>('Base metal P-Nos.').value).toBe('8, 1');
    expect(screen.getByLabelText<HTMLInputElement>('F-No.').value).toBe('5');
  });

  it('offers a plate coupon no pipe positions and a pipe coupon no plate positions (ASME IX QW-461 positions, from memory)', async () => {
    const user = userEvent.setup();
    renderForm({ welderId, code: 'asme-ix', process: 'SMAW' });
    const offered = () => within(screen.getByLabelText('Test position')).getAllByRole('option').map((o) => o.getAttribute('value')).filter(Boolean);
    expect(offered()).toEqual(expect.arrayContaining(['1G', '2G', '3G', '4G', '3G+4G']));
    for (const pipeOnly of ['5G', '6G', '6GR', '2G+5G']) expect(offered()).not.toContain(pipeOnly);
    await user.selectOptions(screen.getByLabelText('Test position'), '3G');
    await user.selectOptions(screen.getByLabelText('Plate or pipe'), 'pipe');
    expect(offered()).toEqual(expect.arrayContaining(['1G', '2G', '5G', '6G', '2G+5G']));
    for (const plateOnly of ['3G', '4G', '3G+4G', '2G+3G+4G']) expect(offered()).not.toContain(plateOnly);
    // 3G is not a pipe position: the choice is cleared rather than kept out of sight.
    expect(screen.getByLabelText<HTMLSelectElement>('Test position').value).toBe('');
    await user.selectOptions(screen.getByLabelText('Groove or fillet'), 'fillet');
    expect(offered()).not.toContain('3F');
    await user.selectOptions(screen.getByLabelText('Plate or pipe'), 'plate');
    expect(offered()).not.toContain('5F');
  });

  it('offers in-house criteria only in addition to the code\'s, in the trade\'s words', () => {
    renderForm({ welderId, code: 'api-1104', process: 'SMAW' });
    const labels = within(screen.getByLabelText('In-house criteria')).getAllByRole('option').map((o) => o.textContent ?? '');
    expect(labels).toEqual(["None: the code's criteria only", "Shop practice, in addition to the code's"]);
    for (const label of labels) expect(label).not.toMatch(/asme-ix|aws-d1\.1|api-1104|shop-general/);
  });

  it('refuses to save while a specimen is not marked examined, naming it', () => {
    const d = draftWith(['1/16']);
    const second = d.specimens[1];
    if (second) second.examined = false;
    const a = analyseDraft(d);
    expect(a.verdict).toBeNull();
    expect(a.notExamined).toBe(true);
    const { input, errors } = toRecordInput(d, a);
    expect(input).toBeNull();
    expect(errors['examination.bend.specimens.1.examined']).toBe('Mark Specimen 2 (side) examined, or remove it');
  });
});

/** An ASME IX pipe coupon in 6G, NPS 2 Sch 80 (ASME B36.10M: 2.375 in OD, 0.218 in wall). */
function pipe6g(over: Partial<CouponDraft> = {}): CouponDraft {
  return {
    ...emptyDraft({ welderId, shopId, code: 'asme-ix', process: 'SMAW', position: '6G', form: 'pipe' }),
    procedureId,
    nps: '2',
    schedule: '80',
    backing: 'without',
    fNumberText: '4',
    progression: 'uphill',
    examinerName: 'Test Examiner',
    visual: 'accept',
    specimensChosen: true,
    ...over,
  };
}
const examined = (kind: 'face' | 'root' | 'side') => ({ ...newSpecimen(kind), examined: true });

describe('the whole examination, judged live with the coupon (the rules the server runs)', () => {
  it('never accepts a 6G pipe coupon on one face and one root bend: the set is incomplete (from memory: ASME IX QW-452.1(a), four bends for 5G and 6G)', () => {
    const two = analyseDraft(pipe6g({ specimens: [examined('face'), examined('root')] }));
    expect(two.verdict).toBeNull();
    expect(two.incomplete).toMatch(/QW-452\.1/);
    const four = analyseDraft(pipe6g({ specimens: [examined('face'), examined('face'), examined('root'), examined('root')] }));
    expect(four.verdict).toBe('accept');
    const { input } = toRecordInput(pipe6g({ specimens: [examined('face'), examined('root')] }), two);
    expect(input?.claimedResult).toBeUndefined();
  });

  it('judges radiography in place of bends by indication type and size: a 1/16 in rounded indication passes on a 0.375 in plate, a crack of any size rejects (from memory: ASME IX QW-191.1.2.2)', () => {
    const rt = (type: 'rounded' | 'crack'): CouponDraft => ({
      ...draftWith([]),
      method: 'radiography',
      volumetricExamined: true,
      indications: [{ ...newIndication(), type, sizeText: '1/16' }],
    });
    const ok = analyseDraft(rt('rounded'));
    expect(ok.verdict).toBe('accept');
    expect(ok.evaluation?.parts.map((p) => p.kind)).toEqual(['visual', 'radiography']);
    const bad = analyseDraft(rt('crack'));
    expect(bad.verdict).toBe('reject');
    expect(bad.reasons[0]).toMatchObject({ clause: 'QW-191.1.2.2', where: 'Radiography' });
    const sent = toRecordInput(rt('crack'), bad).input?.examination as RecordedExaminationInput;
    expect(sent.volumetric?.indications).toEqual([{ type: 'crack', size: { value: 1 / 16, unit: 'in' } }]);
    expect(sent.bend).toBeUndefined();
  });

  it('says "not yet examined" until the radiographs are marked examined', () => {
    const a = analyseDraft({ ...draftWith([]), method: 'radiography', volumetricExamined: false });
    expect(a.verdict).toBeNull();
    expect(a.notExamined).toBe(true);
    expect(a.incomplete).toMatch(/radiographs examined/);
  });

  it('refuses radiography in place of bends for GMAW short-circuit transfer under ASME IX (from memory: ASME IX QW-304)', () => {
    const a = analyseDraft({ ...draftWith([]), process: 'GMAW', transferMode: 'short-circuit', fNumberText: '6', method: 'radiography', volumetricExamined: true });
    expect(a.verdict).toBeNull();
    expect(a.incomplete).toMatch(/QW-304/);
  });

  it('judges a fillet coupon by its fillet weld break and macro-etch, and waits for both (from memory: ASME IX QW-182, QW-184)', () => {
    const fillet: CouponDraft = {
      ...emptyDraft({ welderId, shopId, code: 'asme-ix', process: 'SMAW', position: '2F' }),
      procedureId,
      weld: 'fillet',
      thicknessText: '3/8',
      backing: 'with',
      fNumberText: '4',
      examinerName: 'Test Examiner',
      visual: 'accept',
    };
    const waiting = analyseDraft(fillet);
    expect(waiting.notExamined).toBe(true);
    expect(waiting.incomplete).toMatch(/fillet weld break/);
    const done: CouponDraft = {
      ...fillet,
      filletBreak: { examined: true, bentFlat: 'no', crack: false, incompleteRootFusion: false, inclusionsText: '1/16, 1/8' },
      macro: { examined: true, completeFusion: 'yes', crack: false, leg1Text: '3/8', leg2Text: '5/16', convexityText: '1/32', concavityText: '' },
    };
    const a = analyseDraft(done);
    expect(a.evaluation?.parts.map((p) => p.kind)).toEqual(['visual', 'fillet-break', 'macro-etch']);
    expect(a.verdict).toBe('accept');
    const cracked = analyseDraft({ ...done, filletBreak: { ...done.filletBreak, crack: true } });
    expect(cracked.verdict).toBe('reject');
    expect(cracked.reasons[0]).toMatchObject({ where: 'Fillet weld break', clause: 'QW-181.2, QW-182' });
  });

  it('asks for the nick-breaks of an API 1104 coupon by its OD and wall (from memory: API 1104 welder qualification specimens, OD over 4-1/2 in to 12-3/4 in: 2 root bends and 2 nick-breaks)', () => {
    const api: CouponDraft = {
      ...emptyDraft({ welderId, shopId, code: 'api-1104', process: 'SMAW', position: '6G', form: 'pipe' }),
      procedureId,
      nps: '8',
      schedule: '40',
      backing: 'without',
      progression: 'downhill',
      examinerName: 'Test Examiner',
      visual: 'accept',
      specimensChosen: true,
      specimens: [examined('root'), examined('root')],
    };
    const none = analyseDraft(api);
    expect(none.verdict).toBeNull();
    expect(none.incomplete).toMatch(/nick-break/);
    const one = analyseDraft({ ...api, nickBreaks: [{ ...newNickBreak(), examined: true, sound: 'yes' }] });
    expect(one.verdict).toBeNull();
    expect(one.incomplete).toMatch(/2 nick-break specimens are called for; 1 recorded/);
    const two = analyseDraft({ ...api, nickBreaks: [1, 2].map(() => ({ ...newNickBreak(), examined: true, sound: 'yes' as const })) });
    expect(two.verdict).toBe('accept');
  });

  it('a combination coupon fails every process when one part fails (from memory: ASME IX QW-306)', () => {
    const combo = (size: string): CouponDraft =>
      pipe6g({
        specimens: [examined('face'), examined('face'), { ...examined('root'), discontinuities: [{ ...newDiscontinuity(), sizeText: size }] }, examined('root')],
        combination: true,
        layers: [
          { ...newLayer('GTAW'), depositedText: '1/8' },
          { ...newLayer('SMAW'), depositedText: '3/32' },
        ],
      });
    const ok = analyseDraft(combo('1/32'));
    expect(ok.verdict).toBe('accept');
    const bad = analyseDraft(combo('3/16'));
    expect(bad.verdict).toBe('reject');
    const layers = bad.evaluation?.parts.find((p) => p.kind === 'combination');
    expect(layers?.items?.map((i) => [i.kind, i.result])).toEqual([
      ['GTAW', 'reject'],
      ['SMAW', 'reject'],
    ]);
  });

  it('sends the visual findings with their sizes, and a crack found by eye rejects (from memory: ASME IX QW-194)', () => {
    const d = { ...draftWith([]), visualFindings: [{ ...newFinding(), type: 'crack' as const, sizeText: '1/16' }] };
    const a = analyseDraft(d);
    expect(a.verdict).toBe('reject');
    const input = toRecordInput(d, a).input;
    expect(input?.visual).toEqual({ result: 'accept', findings: [{ type: 'crack', size: { value: 1 / 16, unit: 'in' } }] });
  });
});

/** A rejected ASME IX 1G plate coupon of the welder, as the coupon page hands it to "Record a retest". */
const failedCoupon = (retests: RetestTarget['retests'] = []): RetestTarget => ({
  id: '3c2b1a09-8f7e-4d6c-9b5a-4a3b2c1d0e9f',
  welder: { id: welderId, name: 'Test Welder', stamp: 'PV-07' },
  testedOn: '2026-01-10',
  coupon: {
    code: 'asme-ix',
    process: 'SMAW',
    form: 'plate',
    weld: 'groove',
    position: '1G',
    thickness: { value: 0.25, unit: 'in' },
    backing: false,
    fNumber: 4,
  },
  reasons: [{ clause: 'ASME IX QW-163', message: 'Root bend: a 3/16 in crack (allowed 1/8 in).' }],
  visual: 'accept',
  evaluation: null,
  retests,
});

function renderRetest(failed: RetestTarget) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  return render(
    <MemoryRouter>
      <QueryClientProvider client={client}>
        <CouponForm welders={[welder]} shops={[welder.homeShop]} procedures={[]} prefill={{ retestOf: failed }} onSaved={vi.fn()} onCancel={vi.fn()} />
      </QueryClientProvider>
    </MemoryRouter>,
  );
}

describe('a retest of a failed coupon', { timeout: 60_000 }, () => {
  it('names the failed coupon, offers the retests the code allows with their clauses, and judges the first coupon of an immediate retest live as passing and awaiting the second (from memory: ASME IX QW-321.2, QW-321.4)', async () => {
    const user = userEvent.setup();
    renderRetest(failedCoupon());
    const part = screen.getByRole('group', { name: 'Retest' });
    expect(within(part).getByText(/Retest of the coupon of/)).toBeTruthy();
    expect(within(part).getByText('2026-01-10')).toBeTruthy();
    expect(within(part).getByText('QW-321.2')).toBeTruthy();
    expect(within(part).getByText('QW-321.4')).toBeTruthy();
    // the retest is made by the same welder in the same code, process and position
    expect(screen.getByLabelText<HTMLSelectElement>('Welder').disabled).toBe(true);
    expect(screen.getByLabelText<HTMLSelectElement>('Test position').value).toBe('1G');
    expect(screen.getByLabelText<HTMLSelectElement>('Test position').disabled).toBe(true);

    await user.selectOptions(screen.getByLabelText('Backing'), 'without');
    await user.type(screen.getByLabelText('Coupon thickness'), '1/4');
    await user.selectOptions(screen.getByLabelText('Visual examination'), 'accept');
    await user.click(screen.getByRole('checkbox', { name: 'Specimen 1 (face) examined' }));
    await user.click(screen.getByRole('checkbox', { name: 'Specimen 2 (root) examined' }));
    const panel = screen.getByRole('region', { name: 'Evaluation' });
    // no kind of retest chosen yet: no verdict
    expect(within(panel).queryByText('Accept')).toBeNull();
    await user.click(within(part).getByRole('radio', { name: /Immediate retest \(2 coupons\)/ }));
    expect(within(panel).getByText('Accept')).toBeTruthy();
    expect(within(panel).getByText(/Retest as a whole: 1 of 2 coupons/)).toBeTruthy();
    expect(part.querySelector('[data-retest]')?.getAttribute('data-retest')).toBe('awaiting');

    await user.click(within(part).getByRole('radio', { name: /Retest after further training/ }));
    expect(part.querySelector('[data-retest]')?.getAttribute('data-retest')).toBe('accept');
  });

  it('sends the link to the failed coupon with the kind of retest, and shows an immediate retest failed when its other coupon failed (from memory: ASME IX QW-321.2)', () => {
    const failed = failedCoupon([{ id: 'f0e1d2c3-b4a5-4968-8776-655443322110', testedOn: '2026-01-12', basis: 'immediate', result: 'reject' }]);
    const d: CouponDraft = {
      ...emptyDraft({ retestOf: failed }),
      shopId,
      procedureId,
      thicknessText: '1/4',
      backing: 'without',
      fNumberText: '4',
      examinerName: 'Test Examiner',
      visual: 'accept',
      specimensChosen: true,
      specimens: [{ ...newSpecimen('face'), examined: true }, { ...newSpecimen('root'), examined: true }],
      retestBasis: 'immediate',
    };
    expect(d.welderId).toBe(welderId);
    const a = analyseDraft(d);
    expect(a.verdict).toBe('accept');
    expect(a.evaluation?.retest).toMatchObject({ result: 'reject', needed: 2, recorded: 2 });
    const { input, errors } = toRecordInput(d, a);
    expect(errors).toEqual({});
    expect(input?.claimedResult).toBe('accept');
    expect((input?.examination as RecordedExaminationInput).retest).toMatchObject({ of: failed.id, basis: 'immediate' });
  });
});
