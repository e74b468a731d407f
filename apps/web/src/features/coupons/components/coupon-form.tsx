// Record a qualification test coupon and its examination. Everything the rules can say while the form is
// filled in is said live (lengths as read, pipe OD and wall, the proposed bend specimens, the verdict and
// the qualified ranges); saving sends the live verdict as claimedResult, and the server judges again.
import {
  lengthBounds,
  processes,
  processNames,
  testPositionNames,
  transferModes,
  type CouponRecord,
  type Procedure,
  type ShopRef,
  type Welder,
} from '@beadroll/rules';
import { useMemo, useState, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { FormError, SelectField, TextField } from '@/components/ui/field';
import { PlusIcon } from '@/components/ui/icons';
import { Card } from '@/components/ui/page-header';
import { RangesView } from '@/components/ui/ranges-view';
import { UploadInput } from '@/components/ui/upload-input';
import { ApiError, errorMessage } from '@/lib/api-client';
import { codeNames } from '@/lib/codes';
import { useRecordCoupon } from '../api/record-coupon';
import {
  analyseDraft,
  emptyDraft,
  fromProcedure,
  positionsOffered,
  errorFor,
  newSpecimen,
  partsOf,
  setLabel,
  specimensOf,
  toRecordInput,
  withoutErrors,
  type CouponDraft,
  type DraftPrefill,
  type Errors,
  type SpecimenDraft,
} from '../model/coupon-draft';
import { PipeSizeFields } from './pipe-size-fields';
import { SizeField } from '@/components/ui/size-field';
import { SpecimenEditor } from './specimen-editor';
import { VerdictPanel } from './verdict-panel';
import { CombinationLayers, FilletParts, NickBreaks, RetestPart, VisualFindings, VolumetricPart } from './examination-parts';


const FIELD_WORDS: Record<string, string> = {
  welderId: 'Welder',
  shopId: 'Shop',
  procedureId: 'WPS',
  testedOn: 'Test date',
  'coupon.code': 'Code',
  'coupon.process': 'Process',
  'coupon.transferMode': 'Transfer mode',
  'coupon.position': 'Test position',
  'coupon.thickness': 'Thickness',
  'coupon.outsideDiameter': 'Outside diameter',
  'coupon.depositedThickness': 'Deposited thickness',
  'coupon.layers': 'Layers',
  'coupon.backing': 'Backing',
  'coupon.fNumber': 'F-No.',
  'coupon.progression': 'Progression',
  'coupon.form': 'Plate or pipe',
  'pipe.nps': 'NPS',
  'pipe.schedule': 'Schedule',
  'examiner.name': 'Examiner',
  visual: 'Visual examination',
  'examination.volumetric.examinerResult': 'Examination result',
  'examination.bend.specimens': 'Bend specimens',
  claimedResult: 'Verdict',
};

function fieldWords(key: string): string {
  const specimen = /^examination\.bend\.specimens\.(\d+)(?:\.discontinuities\.(\d+))?/.exec(key);
  if (specimen) return `Specimen ${Number(specimen[1]) + 1}${specimen[2] !== undefined ? `, discontinuity ${Number(specimen[2]) + 1}` : ''}`;
  const direct = Object.keys(FIELD_WORDS).find((k) => key === k || key.startsWith(`${k}.`));
  return direct ? (FIELD_WORDS[direct] ?? key) : key;
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <Card className="p-4">
      <h2 className="mb-3 font-bold text-stone-900">{title}</h2>
      {children}
    </Card>
  );
}

interface CouponFormProps {
  welders: Welder[];
  shops: ShopRef[];
  procedures: Procedure[];
  prefill: DraftPrefill;
  onSaved: (coupon: CouponRecord) => void;
  onCancel: () => void;
}

export function CouponForm({ welders, shops, procedures, prefill, onSaved, onCancel }: CouponFormProps) {
  const record = useRecordCoupon();
  const [draft, setDraft] = useState<CouponDraft>(() => {
    const welder = welders.find((w) => w.id === prefill.welderId);
    return emptyDraft({ ...prefill, shopId: prefill.shopId ?? welder?.homeShop.id });
  });
  const [shown, setShown] = useState<Errors>({});
  const [formError, setFormError] = useState<string | undefined>();
  const [focusKey, setFocusKey] = useState<string | null>(null);
  const analysis = useMemo(() => analyseDraft(draft), [draft]);

  // Live errors of what was typed show at once; "required" ones only after a save attempt (shown).
  const errors: Errors = { ...shown, ...analysis.errors };

  /** Applies a change and clears the saved-attempt errors of the fields it touched. */
  const change = (next: Partial<CouponDraft>, ...paths: string[]) => {
    setDraft((d) => {
      const merged = { ...d, ...next };
      // Until the person picks the specimens, follow the proposal for the coupon as it now stands.
      if (!merged.specimensChosen && partsOf(merged).bend) {
        const proposal = analyseDraft(merged).proposal;
        const first = proposal?.known ? proposal.options[0] : undefined;
        if (first && setLabel(first) !== setLabel(summarise(merged.specimens))) merged.specimens = specimensOf(first);
      }
      return merged;
    });
    if (paths.length > 0) setShown((s) => paths.reduce(withoutErrors, s));
  };

  const setSpecimens = (specimens: SpecimenDraft[], path?: string) => change({ specimens, specimensChosen: true }, ...(path ? [path] : []));

  const chosenWelder = welders.find((w) => w.id === draft.welderId);
  const chosenProcedure = procedures.find((p) => p.id === draft.procedureId);
  const offered = procedures.filter(
    (p) => p.status === 'active' && p.code === draft.code && draft.process !== '' && p.processes.includes(draft.process),
  );

  const save = () => {
    setFormError(undefined);
    const { input, errors: found } = toRecordInput(draft, analysis);
    if (!input) {
      setShown(found);
      setFormError('Some of the record needs attention; each problem is shown at its field and listed here.');
      return;
    }
    record.mutate(input, {
      onSuccess: onSaved,
      onError: (error) => {
        if (error instanceof ApiError && Object.keys(error.fields).length > 0) {
          setShown(error.fields);
          setFormError(error.message);
        } else setFormError(errorMessage(error));
      },
    });
  };

  const summary = Object.entries(errors);
  const retest = draft.retestOf !== null;
  const parts = partsOf(draft);
  const vertical = analysis.ranges ? analysis.ranges.positions.groove.includes('V') || analysis.ranges.positions.fillet.includes('V') : false;

  return (
    <form
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        save();
      }}
      className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]"
    >
      <div className="space-y-4">
        <Section title="The test">
          <div className="grid gap-3 sm:grid-cols-2">
            <SelectField
              label="Welder"
              value={draft.welderId}
              disabled={retest}
              hint={retest ? 'A retest is made by the welder who failed the test.' : undefined}
              error={errorFor(errors, 'welderId')}
              onChange={(e) => {
                const w = welders.find((x) => x.id === e.target.value);
                change({ welderId: e.target.value, shopId: draft.shopId || w?.homeShop.id || '' }, 'welderId');
              }}
            >
              <option value="">Choose a welder…</option>
              {draft.retestOf && !welders.some((w) => w.id === draft.retestOf?.welder.id) && (
                <option value={draft.retestOf.welder.id}>
                  {draft.retestOf.welder.stamp} · {draft.retestOf.welder.name}
                </option>
              )}
              {welders.map((w) => (
                <option key={w.id} value={w.id}>
                  {w.stamp} · {w.name}
                </option>
              ))}
            </SelectField>
            <SelectField label="Shop" value={draft.shopId} error={errorFor(errors, 'shopId')} onChange={(e) => change({ shopId: e.target.value }, 'shopId')} hint={chosenWelder ? `Home shop: ${chosenWelder.homeShop.name}` : undefined}>
              <option value="">Choose a shop…</option>
              {shops.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.code} · {s.name}
                </option>
              ))}
            </SelectField>
            <TextField label="Test date" type="date" value={draft.testedOn} max={new Date().toISOString().slice(0, 10)} error={errorFor(errors, 'testedOn')} onChange={(e) => change({ testedOn: e.target.value }, 'testedOn')} />
            <SelectField
              label="Code"
              value={draft.code}
              disabled={retest}
              error={errorFor(errors, 'coupon.code')}
              onChange={(e) => {
                const code = e.target.value as CouponDraft['code'];
                const position = positionsOffered(code, draft.form, draft.weld).some((p) => p === draft.position) ? draft.position : '';
                change({ code, position, procedureId: '', criteria: code || draft.criteria }, 'coupon.code', 'procedureId', 'examination.criteria');
              }}
            >
              <option value="">Choose the code…</option>
              {Object.entries(codeNames).map(([id, name]) => (
                <option key={id} value={id}>
                  {name}
                </option>
              ))}
            </SelectField>
            <SelectField label="Process" value={draft.process} disabled={retest} error={errorFor(errors, 'coupon.process')} onChange={(e) => change({ process: e.target.value as CouponDraft['process'], procedureId: '' }, 'coupon.process', 'procedureId')}>
              <option value="">Choose the process…</option>
              {processes.map((p) => (
                <option key={p} value={p}>
                  {p} · {processNames[p]}
                </option>
              ))}
            </SelectField>
            {draft.process === 'GMAW' && (
              <SelectField label="Transfer mode" value={draft.transferMode} error={errorFor(errors, 'coupon.transferMode')} onChange={(e) => change({ transferMode: e.target.value as CouponDraft['transferMode'] }, 'coupon.transferMode')}>
                <option value="">Choose the transfer mode…</option>
                {transferModes.map((m) => (
                  <option key={m} value={m}>
                    {m}
                  </option>
                ))}
              </SelectField>
            )}
            <SelectField
              label="WPS"
              value={draft.procedureId}
              error={errorFor(errors, 'procedureId')}
              disabled={!draft.code || !draft.process}
              hint={!draft.code || !draft.process ? 'Choose the code and process first; only active WPSs of both are offered.' : offered.length === 0 ? 'No active WPS of this code covers this process. Add one under Procedures.' : undefined}
              onChange={(e) => {
                const p = offered.find((x) => x.id === e.target.value);
                change({ procedureId: e.target.value, ...(p ? fromProcedure(p) : {}) }, 'procedureId', 'pNumbers', 'coupon.fNumber');
              }}
            >
              <option value="">Choose the WPS…</option>
              {offered.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.number} rev {p.revision}
                </option>
              ))}
            </SelectField>
            <TextField label="Base metal P-Nos." value={draft.pNumbersText} placeholder="1, or 8, 1" hint={chosenProcedure ? `Filled from WPS ${chosenProcedure.number}; change it if the coupon differs.` : 'As on the WPS; separate with commas.'} error={errorFor(errors, 'pNumbers')} onChange={(e) => change({ pNumbersText: e.target.value }, 'pNumbers')} />
          </div>
        </Section>

        <Section title="The coupon">
          <div className="grid gap-3 sm:grid-cols-2">
            <SelectField
              label="Plate or pipe"
              value={draft.form}
              disabled={retest}
              onChange={(e) => {
                const form = e.target.value as CouponDraft['form'];
                const position = positionsOffered(draft.code, form, draft.weld).some((p) => p === draft.position) ? draft.position : '';
                change({ form, position }, 'coupon.form', 'coupon.outsideDiameter', 'pipe', 'coupon.position');
              }}
            >
              <option value="plate">Plate</option>
              <option value="pipe">Pipe</option>
            </SelectField>
            <SelectField
              label="Groove or fillet"
              value={draft.weld}
              onChange={(e) => change({ weld: e.target.value as CouponDraft['weld'], position: '' }, 'coupon.weld', 'coupon.position')}
            >
              <option value="groove">Groove weld</option>
              <option value="fillet">Fillet weld</option>
            </SelectField>
            <SelectField label="Test position" value={draft.position} disabled={retest} hint={retest ? 'A retest is made in the position failed.' : undefined} error={errorFor(errors, 'coupon.position')} onChange={(e) => change({ position: e.target.value }, 'coupon.position')}>
              <option value="">Choose the position…</option>
              {positionsOffered(draft.code, draft.form, draft.weld).map((p) => (
                  <option key={p} value={p}>
                    {p} · {testPositionNames[p]}
                  </option>
                ))}
            </SelectField>
            <SelectField label="Backing" value={draft.backing} error={errorFor(errors, 'coupon.backing')} onChange={(e) => change({ backing: e.target.value as CouponDraft['backing'] }, 'coupon.backing')}>
              <option value="">Choose…</option>
              <option value="with">With backing</option>
              <option value="without">Without backing (open root)</option>
            </SelectField>
            {draft.form === 'pipe' && (
              <SelectField label="Pipe given by" value={draft.pipeBy} onChange={(e) => change({ pipeBy: e.target.value as CouponDraft['pipeBy'] }, 'pipe', 'coupon.thickness', 'coupon.outsideDiameter')} wrapperClassName="sm:col-span-2">
                <option value="size">NPS and schedule</option>
                <option value="measured">Measured outside diameter and wall</option>
              </SelectField>
            )}
            {draft.form === 'pipe' && draft.pipeBy === 'size' ? (
              <div className="sm:col-span-2">
                <PipeSizeFields nps={draft.nps} schedule={draft.schedule} errors={errors} onChange={(c) => change(c, 'pipe', 'coupon.thickness', 'coupon.outsideDiameter')} />
              </div>
            ) : (
              <>
                <SizeField label={draft.form === 'pipe' ? 'Wall thickness' : 'Coupon thickness'} positive bounds={lengthBounds.thickness} value={draft.thicknessText} error={errorFor(errors, 'coupon.thickness')} onChange={(t) => change({ thicknessText: t }, 'coupon.thickness')} placeholder="3/8, 10 mm" />
                {draft.form === 'pipe' && (
                  <SizeField label="Outside diameter" positive bounds={lengthBounds.outsideDiameter} value={draft.outsideDiameterText} error={errorFor(errors, 'coupon.outsideDiameter')} onChange={(t) => change({ outsideDiameterText: t }, 'coupon.outsideDiameter')} placeholder="2.375 in, 60.3 mm" />
                )}
              </>
            )}
            <SizeField label="Deposited weld metal thickness" positive bounds={lengthBounds.depositedThickness} value={draft.depositedText} error={errorFor(errors, 'coupon.depositedThickness')} onChange={(t) => change({ depositedText: t }, 'coupon.depositedThickness')} hint="By this welder with this process; the coupon thickness if left empty." placeholder="3/8, 10 mm" />
            <TextField label="Layers" inputMode="numeric" value={draft.layersText} error={errorFor(errors, 'coupon.layers')} onChange={(e) => change({ layersText: e.target.value }, 'coupon.layers')} />
            <TextField label="F-No." inputMode="numeric" value={draft.fNumberText} error={errorFor(errors, 'coupon.fNumber')} hint={chosenProcedure?.fNumber != null ? `Filled from WPS ${chosenProcedure.number}.` : 'Filler metal F-Number; empty for no filler.'} onChange={(e) => change({ fNumberText: e.target.value }, 'coupon.fNumber')} />
            <SelectField
              label="Vertical progression"
              value={draft.progression}
              error={errorFor(errors, 'coupon.progression')}
              hint={vertical ? 'This test qualifies vertical welding: say uphill or downhill.' : undefined}
              onChange={(e) => change({ progression: e.target.value as CouponDraft['progression'] }, 'coupon.progression')}
            >
              <option value="">Not vertical / not stated</option>
              <option value="uphill">Uphill</option>
              <option value="downhill">Downhill</option>
            </SelectField>
          </div>
        </Section>

        <Section title="Examination">
          <div className="grid gap-3 sm:grid-cols-2">
            <TextField label="Examiner name" value={draft.examinerName} error={errorFor(errors, 'examiner.name')} onChange={(e) => change({ examinerName: e.target.value }, 'examiner.name')} />
            <TextField label="Examiner certificate number" value={draft.examinerCertificate} error={errorFor(errors, 'examiner.certificateNumber')} onChange={(e) => change({ examinerCertificate: e.target.value }, 'examiner.certificateNumber')} />
            <TextField label="Lab report number" value={draft.labReportNumber} error={errorFor(errors, 'labReportNumber')} onChange={(e) => change({ labReportNumber: e.target.value }, 'labReportNumber')} />
            <SelectField label="Visual examination" value={draft.visual} error={errorFor(errors, 'visual')} onChange={(e) => change({ visual: e.target.value as CouponDraft['visual'] }, 'visual', 'claimedResult')}>
              <option value="">Choose…</option>
              <option value="accept">Accept</option>
              <option value="reject">Reject</option>
            </SelectField>
            {draft.visual !== '' && <VisualFindings draft={draft} errors={errors} change={change} />}
            {!parts.fillet && (
              <SelectField label="Examined by" value={draft.method} hint={draft.code === 'api-1104' && draft.method === 'bend' ? 'API 1104 welder tests are nick-broken as well as bent.' : undefined} onChange={(e) => change({ method: e.target.value as CouponDraft['method'] }, 'examination', 'claimedResult')}>
                <option value="bend">Guided bend tests</option>
                <option value="radiography">Radiography in place of bends</option>
                <option value="ultrasonic">Ultrasonic examination in place of bends</option>
              </SelectField>
            )}
            {parts.bend && (
              <SelectField label="In-house criteria" value={draft.criteria === 'shop-general' ? 'shop-general' : ''} hint="The code's own criteria always apply; an in-house set can only add to them." error={errorFor(errors, 'examination.criteria') ?? errorFor(errors, 'examination.additionalCriteria')} onChange={(e) => change({ criteria: e.target.value === 'shop-general' ? 'shop-general' : draft.code || 'asme-ix' }, 'examination.criteria', 'claimedResult')}>
                <option value="">None: the code's criteria only</option>
                <option value="shop-general">Shop practice, in addition to the code's</option>
              </SelectField>
            )}
          </div>

          {parts.bend && (
            <div className="mt-4 space-y-3">
              {analysis.proposal && (
                <div className="rounded-md border border-accent-200 bg-accent-50 px-3 py-2 text-sm text-accent-800">
                  <p>
                    {analysis.proposal.text}
                    {analysis.proposal.clause && <span className="ml-1 font-semibold">({analysis.proposal.clause})</span>}
                  </p>
                  {analysis.proposal.known && (
                    <div className="mt-2 flex flex-wrap gap-2">
                      {analysis.proposal.options.map((set) => (
                        <Button key={setLabel(set)} size="row" onClick={() => setSpecimens(specimensOf(set), 'examination.bend.specimens')}>
                          Use {setLabel(set)}
                        </Button>
                      ))}
                    </div>
                  )}
                </div>
              )}
              {draft.specimens.length === 0 && (
                <p className="text-sm text-stone-600">
                  {analysis.proposal ? 'Add the specimens the code asks for.' : 'Enter the code, position and thickness for the proposed specimens, or add them yourself.'}
                </p>
              )}
              {errors['examination.bend'] && <p className="text-sm text-red-700">{errors['examination.bend']}</p>}
              {errorFor(errors, 'examination.bend.specimens') && !/\.\d+/.test(Object.keys(errors).find((k) => k.startsWith('examination.bend.specimens')) ?? '') && (
                <p className="text-sm text-red-700">{errorFor(errors, 'examination.bend.specimens')}</p>
              )}
              {draft.specimens.map((s, i) => (
                <SpecimenEditor
                  key={s.key}
                  specimen={s}
                  index={i}
                  errors={errors}
                  focusKey={focusKey}
                  onAdded={setFocusKey}
                  onChange={(next, path) => setSpecimens(draft.specimens.map((x, k) => (k === i ? next : x)), path ?? `examination.bend.specimens.${i}`)}
                  onRemove={() => setSpecimens(draft.specimens.filter((_, k) => k !== i), 'examination.bend.specimens')}
                />
              ))}
              <div className="flex flex-wrap gap-2">
                {(['face', 'root', 'side'] as const).map((kind) => (
                  <Button key={kind} onClick={() => setSpecimens([...draft.specimens, newSpecimen(kind)], 'examination.bend.specimens')}>
                    <PlusIcon /> Add a {kind} bend
                  </Button>
                ))}
              </div>
            </div>
          )}
          {parts.volumetric && (
            <>
              <VolumetricPart draft={draft} errors={errors} change={change} />
              <div className="mt-3 grid gap-3 sm:grid-cols-2">
                <SelectField label="Verdict of the examination report" value={draft.volumetricResult} hint="Optional; a reject on the report always rejects." error={errorFor(errors, 'examination.volumetric.examinerResult')} onChange={(e) => change({ volumetricResult: e.target.value as CouponDraft['volumetricResult'] }, 'examination.volumetric.examinerResult', 'claimedResult')}>
                  <option value="">Not recorded</option>
                  <option value="accept">Accept</option>
                  <option value="reject">Reject</option>
                </SelectField>
                <TextField label="Examination report number" value={draft.reportNumber} error={errorFor(errors, 'examination.volumetric.reportNumber')} onChange={(e) => change({ reportNumber: e.target.value }, 'examination.volumetric.reportNumber')} />
                <div className="sm:col-span-2">
                  <UploadInput label="Examination report" kind="examination-report" value={draft.report} error={errorFor(errors, 'examination.volumetric.reportUploadId')} onChange={(report) => change({ report }, 'examination.volumetric.reportUploadId')} hint="PDF or image, up to 15 MB." />
                </div>
              </div>
            </>
          )}
          {parts.fillet && <FilletParts draft={draft} errors={errors} change={change} />}
          {parts.nickBreak && <NickBreaks draft={draft} errors={errors} change={change} hint={parts.bend ? analysis.proposal?.text : undefined} />}
          <CombinationLayers draft={draft} errors={errors} change={change} />
          <RetestPart draft={draft} errors={errors} change={change} set={analysis.evaluation?.retest ?? null} />
          <TextField label="Notes" wrapperClassName="mt-3" value={draft.notes} error={errorFor(errors, 'notes')} onChange={(e) => change({ notes: e.target.value }, 'notes')} />
        </Section>
      </div>

      <div className="space-y-4 lg:sticky lg:top-4 lg:self-start">
        <VerdictPanel analysis={analysis} />
        <Card className="p-4">
          {analysis.ranges ? (
            <RangesView ranges={analysis.ranges} heading="Qualified ranges if this coupon passes" showSources />
          ) : (
            <p className="text-sm text-stone-600">
              {analysis.missing.length > 0 ? `Enter ${analysis.missing.join(', ')} to see the ranges this coupon would qualify.` : 'Fix the fields marked in red to see the ranges.'}
            </p>
          )}
        </Card>
        <Card className="p-4">
          {formError && <FormError message={formError} />}
          {summary.length > 0 && formError && (
            <ul className="mt-2 list-disc pl-5 text-sm text-red-800">
              {summary.map(([key, message]) => (
                <li key={key}>
                  <span className="font-semibold">{fieldWords(key)}:</span> {message}
                </li>
              ))}
            </ul>
          )}
          <p className="mt-2 text-sm text-stone-700">
            Saving records the verdict {analysis.verdict ? <strong>{analysis.verdict.replace('-', ' ')}</strong> : '(none yet)'}; Beadroll evaluates again and refuses the record if it disagrees.
          </p>
          <div className="mt-3 flex flex-wrap justify-end gap-2">
            <Button onClick={onCancel}>Cancel</Button>
            <Button type="submit" variant="primary" busy={record.isPending}>
              Save coupon
            </Button>
          </div>
        </Card>
      </div>
    </form>
  );
}

function summarise(specimens: SpecimenDraft[]) {
  const counts = new Map<string, number>();
  for (const s of specimens) counts.set(s.kind, (counts.get(s.kind) ?? 0) + 1);
  return [...counts].map(([kind, count]) => ({ kind: kind as SpecimenDraft['kind'], count }));
}
