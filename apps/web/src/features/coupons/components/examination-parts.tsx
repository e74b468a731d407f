// The parts of a coupon's examination other than the bend specimens: visual findings, radiography or
// ultrasonic indications by type and size, the fillet weld break and macro-etch of a fillet coupon,
// API 1104 nick-breaks, the processes of a combination coupon, and a retest's link to the failed test. Each part is marked examined before
// it is judged; sizes are typed as on the bend specimens ('1/16', '1.5 mm').
import { indicationTypes, lengthBounds, processes, retestOptions, visualFindingTypes, type RetestSetVerdict } from '@beadroll/rules';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import type { ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { Checkbox, SelectField, TextField } from '@/components/ui/field';
import { PlusIcon } from '@/components/ui/icons';
import { SizeField } from '@/components/ui/size-field';
import {
  errorFor,
  newFinding,
  newIndication,
  newLayer,
  newNickBreak,
  type CouponDraft,
  type Errors,
} from '../model/coupon-draft';
import { INDICATION_WORDS, RETEST_BASIS_WORDS, VISUAL_FINDING_WORDS } from '../model/examination-words';

type Change = (next: Partial<CouponDraft>, ...paths: string[]) => void;
interface PartProps {
  draft: CouponDraft;
  errors: Errors;
  change: Change;
}

function Part({ title, children, error }: { title: string; children: ReactNode; error?: string | undefined }) {
  return (
    <fieldset className="mt-4 rounded-lg border border-stone-200 bg-white p-3" aria-label={title}>
      <legend className="px-1 text-sm font-bold text-stone-800">{title}</legend>
      {error && <p className="mb-2 text-sm text-red-700">{error}</p>}
      {children}
    </fieldset>
  );
}

const Remove = ({ label, onClick }: { label: string; onClick: () => void }) => (
  <Button variant="ghost" aria-label={label} onClick={onClick}>
    Remove
  </Button>
);

export function VisualFindings({ draft, errors, change }: PartProps) {
  const set = (findings: CouponDraft['visualFindings']) => change({ visualFindings: findings }, 'visual', 'claimedResult');
  return (
    <div className="mt-3 space-y-2 sm:col-span-2">
      {draft.visualFindings.map((f, i) => {
        const name = `visual finding ${i + 1}`;
        return (
          <div key={f.key} role="group" aria-label={`Visual finding ${i + 1}`} className="grid items-end gap-2 rounded-md bg-stone-50 p-2 sm:grid-cols-[1fr_1fr_auto]">
            <SelectField label={<>Type<span className="sr-only"> of {name}</span></>} value={f.type} error={errorFor(errors, `visual.findings.${i}.type`)} onChange={(e) => set(draft.visualFindings.map((x, k) => (k === i ? { ...x, type: e.target.value as typeof f.type } : x)))}>
              <option value="">Choose…</option>
              {visualFindingTypes.map((t) => (
                <option key={t} value={t}>
                  {VISUAL_FINDING_WORDS[t]}
                </option>
              ))}
            </SelectField>
            <SizeField label={<>Size<span className="sr-only"> of {name}</span></>} value={f.sizeText} bounds={lengthBounds.discontinuity} hint="Depth of undercut or concavity, height of reinforcement, else the largest dimension." error={errorFor(errors, `visual.findings.${i}.size`)} onChange={(t) => set(draft.visualFindings.map((x, k) => (k === i ? { ...x, sizeText: t } : x)))} />
            <Remove label={`Remove ${name}`} onClick={() => set(draft.visualFindings.filter((_, k) => k !== i))} />
          </div>
        );
      })}
      <Button onClick={() => set([...draft.visualFindings, newFinding()])}>
        <PlusIcon /> Add a visual finding
      </Button>
    </div>
  );
}

export function VolumetricPart({ draft, errors, change }: PartProps) {
  const words = draft.method === 'radiography' ? 'Radiography' : 'Ultrasonic examination';
  const set = (indications: CouponDraft['indications']) => change({ indications }, 'examination.volumetric', 'claimedResult');
  return (
    <Part title={words} error={errors['examination.volumetric'] ?? errors['examination.bend']}>
      <div className="space-y-2">
        {draft.indications.length === 0 && <p className="text-sm text-stone-600">No indications entered: the weld shows none.</p>}
        {draft.indications.map((x, i) => {
          const name = `indication ${i + 1}`;
          return (
            <div key={x.key} role="group" aria-label={`Indication ${i + 1}`} className="grid items-end gap-2 rounded-md bg-stone-50 p-2 sm:grid-cols-[1fr_1fr_auto]">
              <SelectField label={<>Type<span className="sr-only"> of {name}</span></>} value={x.type} error={errorFor(errors, `examination.volumetric.indications.${i}.type`)} onChange={(e) => set(draft.indications.map((y, k) => (k === i ? { ...y, type: e.target.value as typeof x.type } : y)))}>
                <option value="">Choose…</option>
                {indicationTypes.map((t) => (
                  <option key={t} value={t}>
                    {INDICATION_WORDS[t]}
                  </option>
                ))}
              </SelectField>
              <SizeField label={<>Size<span className="sr-only"> of {name}</span></>} positive value={x.sizeText} bounds={lengthBounds.discontinuity} hint="Length of a linear indication, largest dimension of a rounded one." error={errorFor(errors, `examination.volumetric.indications.${i}.size`)} onChange={(t) => set(draft.indications.map((y, k) => (k === i ? { ...y, sizeText: t } : y)))} />
              <Remove label={`Remove ${name}`} onClick={() => set(draft.indications.filter((_, k) => k !== i))} />
            </div>
          );
        })}
        <Button onClick={() => set([...draft.indications, newIndication()])}>
          <PlusIcon /> Add an indication
        </Button>
        <Checkbox label={`${draft.method === 'radiography' ? 'Radiographs' : 'Ultrasonic record'} examined, every indication entered`} checked={draft.volumetricExamined} onChange={(e) => change({ volumetricExamined: e.target.checked }, 'claimedResult')} />
      </div>
    </Part>
  );
}

const yesNo = (label: string, value: 'yes' | 'no' | '', onChange: (v: 'yes' | 'no' | '') => void, error?: string) => (
  <SelectField label={label} value={value} error={error} onChange={(e) => onChange(e.target.value as 'yes' | 'no' | '')}>
    <option value="">Choose…</option>
    <option value="yes">Yes</option>
    <option value="no">No</option>
  </SelectField>
);

export function FilletParts({ draft, errors, change }: PartProps) {
  const b = draft.filletBreak;
  const m = draft.macro;
  const setB = (next: Partial<CouponDraft['filletBreak']>) => change({ filletBreak: { ...b, ...next } }, 'examination.filletBreak', 'claimedResult');
  const setM = (next: Partial<CouponDraft['macro']>) => change({ macro: { ...m, ...next } }, 'examination.macroEtch', 'claimedResult');
  return (
    <>
      <Part title="Fillet weld break" error={errors['examination.filletBreak']}>
        <div className="grid gap-3 sm:grid-cols-2">
          {yesNo('Bent flat upon itself without fracture', b.bentFlat, (v) => setB({ bentFlat: v }), errorFor(errors, 'examination.filletBreak.bentFlat'))}
          <TextField label="Inclusions and pores on the fracture" placeholder="1/16, 1 mm" hint="Largest dimension of each, separated by commas." value={b.inclusionsText} error={errorFor(errors, 'examination.filletBreak.inclusions')} onChange={(e) => setB({ inclusionsText: e.target.value })} />
          <Checkbox label="Crack on the fracture surface" checked={b.crack} onChange={(e) => setB({ crack: e.target.checked })} />
          <Checkbox label="Incomplete fusion at the root" checked={b.incompleteRootFusion} onChange={(e) => setB({ incompleteRootFusion: e.target.checked })} />
          <Checkbox label="Fillet weld break examined" checked={b.examined} onChange={(e) => setB({ examined: e.target.checked })} />
        </div>
      </Part>
      <Part title="Macro-etch" error={errors['examination.macroEtch']}>
        <div className="grid gap-3 sm:grid-cols-2">
          {yesNo('Complete fusion on the etched section', m.completeFusion, (v) => setM({ completeFusion: v }), errorFor(errors, 'examination.macroEtch.completeFusion'))}
          <Checkbox label="Crack on the etched section" checked={m.crack} onChange={(e) => setM({ crack: e.target.checked })} />
          <SizeField label="First leg" positive value={m.leg1Text} bounds={lengthBounds.discontinuity} error={errorFor(errors, 'examination.macroEtch.legs.0')} onChange={(t) => setM({ leg1Text: t })} />
          <SizeField label="Second leg" positive value={m.leg2Text} bounds={lengthBounds.discontinuity} error={errorFor(errors, 'examination.macroEtch.legs.1')} onChange={(t) => setM({ leg2Text: t })} />
          <SizeField label="Convexity" value={m.convexityText} bounds={lengthBounds.discontinuity} error={errorFor(errors, 'examination.macroEtch.convexity')} onChange={(t) => setM({ convexityText: t })} />
          <SizeField label="Concavity" value={m.concavityText} bounds={lengthBounds.discontinuity} error={errorFor(errors, 'examination.macroEtch.concavity')} onChange={(t) => setM({ concavityText: t })} />
          <Checkbox label="Macro-etch examined" checked={m.examined} onChange={(e) => setM({ examined: e.target.checked })} />
        </div>
      </Part>
    </>
  );
}

export function NickBreaks({ draft, errors, change, hint }: PartProps & { hint?: string | undefined }) {
  const set = (nickBreaks: CouponDraft['nickBreaks']) => change({ nickBreaks }, 'examination.nickBreak', 'claimedResult');
  return (
    <Part title="Nick-break tests" error={errors['examination.nickBreak']}>
      {hint && <p className="mb-2 text-sm text-stone-700">{hint}</p>}
      <div className="space-y-2">
        {draft.nickBreaks.map((n, i) => {
          const name = `Nick-break ${i + 1}`;
          return (
            <div key={n.key} role="group" aria-label={name} className="grid items-end gap-2 rounded-md bg-stone-50 p-2 sm:grid-cols-[1fr_1fr_auto_auto]">
              {yesNo(`Complete penetration and fusion (${name})`, n.sound, (v) => set(draft.nickBreaks.map((x, k) => (k === i ? { ...x, sound: v } : x))), errorFor(errors, `examination.nickBreak.specimens.${i}.completePenetrationAndFusion`))}
              <TextField label={`Gas pockets (${name})`} placeholder="1/16, 1 mm" hint="Largest dimension of each." value={n.gasPocketsText} error={errorFor(errors, `examination.nickBreak.specimens.${i}.gasPockets`)} onChange={(e) => set(draft.nickBreaks.map((x, k) => (k === i ? { ...x, gasPocketsText: e.target.value } : x)))} />
              <Checkbox label="Examined" aria-label={`${name} examined`} checked={n.examined} onChange={(e) => set(draft.nickBreaks.map((x, k) => (k === i ? { ...x, examined: e.target.checked } : x)))} />
              <Remove label={`Remove ${name}`} onClick={() => set(draft.nickBreaks.filter((_, k) => k !== i))} />
            </div>
          );
        })}
        <Button onClick={() => set([...draft.nickBreaks, newNickBreak()])}>
          <PlusIcon /> Add a nick-break
        </Button>
      </div>
    </Part>
  );
}

export function CombinationLayers({ draft, errors, change }: PartProps) {
  const set = (layers: CouponDraft['layers']) => change({ layers }, 'examination.layers', 'claimedResult');
  return (
    <div className="mt-4">
      <Checkbox
        label="Combination coupon: root and fill welded by different methods, for example a GTAW root and SMAW fill"
        checked={draft.combination}
        onChange={(e) =>
          change(
            {
              combination: e.target.checked,
              layers: e.target.checked && draft.layers.length === 0 ? [newLayer(draft.process), newLayer()] : draft.layers,
            },
            'examination.layers',
            'claimedResult',
          )
        }
      />
      {draft.combination && (
        <Part title="Processes of the combination coupon" error={errors['examination.layers']}>
          <p className="mb-2 text-sm text-stone-700">Root first. Each process qualifies the weld metal it deposited; a failure of any part of the examination fails every process (QW-306).</p>
          <div className="space-y-2">
            {draft.layers.map((l, i) => (
              <div key={l.key} role="group" aria-label={`Process ${i + 1}`} className="grid items-end gap-2 rounded-md bg-stone-50 p-2 sm:grid-cols-[1fr_1fr_auto]">
                <SelectField label={`Process ${i + 1}`} value={l.process} error={errorFor(errors, `examination.layers.${i}.process`)} onChange={(e) => set(draft.layers.map((x, k) => (k === i ? { ...x, process: e.target.value as typeof l.process } : x)))}>
                  <option value="">Choose…</option>
                  {processes.map((p) => (
                    <option key={p} value={p}>
                      {p}
                    </option>
                  ))}
                </SelectField>
                <SizeField label={`Deposited by process ${i + 1}`} positive value={l.depositedText} bounds={lengthBounds.depositedThickness} error={errorFor(errors, `examination.layers.${i}.depositedThickness`)} onChange={(t) => set(draft.layers.map((x, k) => (k === i ? { ...x, depositedText: t } : x)))} />
                {draft.layers.length > 2 && <Remove label={`Remove process ${i + 1}`} onClick={() => set(draft.layers.filter((_, k) => k !== i))} />}
              </div>
            ))}
            {draft.layers.length < 4 && (
              <Button onClick={() => set([...draft.layers, newLayer()])}>
                <PlusIcon /> Add a process
              </Button>
            )}
          </div>
        </Part>
      )}
    </div>
  );
}

/**
 * A retest (the coupon page's "Record a retest" passes the failed coupon): which failed coupon, the kinds
 * of retest the code allows with their clause, the retests already made of it, and the retest as a whole.
 */
export function RetestPart({ draft, errors, change, set }: PartProps & { set: RetestSetVerdict | null }) {
  const failed = draft.retestOf;
  if (!failed || !draft.code) return null;
  const options = retestOptions(draft.code);
  return (
    <Part title="Retest" error={errorFor(errors, 'examination.retest.of')}>
      <p className="text-sm text-stone-800">
        Retest of the coupon of <span className="tabular-nums">{failed.testedOn}</span> ({failed.coupon.process}, {failed.coupon.position} {failed.coupon.form}), which did not pass
        {failed.reasons[0] ? `: ${failed.reasons[0].message}` : '.'}{' '}
        <Link className="font-semibold text-accent-700 underline" to={paths.coupon.href(failed.id)}>
          Open the failed coupon
        </Link>
      </p>
      {failed.retests.length > 0 && (
        <p className="mt-1 text-sm text-stone-700">
          Retests already recorded of it:{' '}
          {failed.retests.map((r) => `${r.testedOn} (${RETEST_BASIS_WORDS[r.basis].toLowerCase()}, ${r.result === 'accept' ? 'passed' : r.result === 'reject' ? 'failed' : 'specimen to replace'})`).join('; ')}.
        </p>
      )}
      <div role="radiogroup" aria-label="Kind of retest" className="mt-3 space-y-2">
        {options.map((o) => (
          <label key={o.basis} className="flex min-h-11 items-start gap-2 rounded-md border border-stone-200 p-2 text-sm">
            <input
              type="radio"
              name="retest-basis"
              className="mt-1"
              checked={draft.retestBasis === o.basis}
              onChange={() => change({ retestBasis: o.basis }, 'examination.retest', 'claimedResult')}
            />
            <span>
              <span className="font-semibold">{RETEST_BASIS_WORDS[o.basis]}</span>
              {o.coupons > 1 ? ` (${o.coupons} coupons)` : ''}: {o.text} <span className="whitespace-nowrap rounded bg-stone-100 px-1 text-xs font-semibold">{o.clause}</span>
            </span>
          </label>
        ))}
      </div>
      {errorFor(errors, 'examination.retest.basis') && <p className="mt-1 text-sm text-red-700">{errorFor(errors, 'examination.retest.basis')}</p>}
      {set && (
        <p className="mt-3 rounded-md bg-stone-50 px-3 py-2 text-sm text-stone-800" data-retest={set.result}>
          <span className="font-semibold">The retest as a whole: {set.result === 'accept' ? 'passes' : set.result === 'reject' ? 'fails' : `${set.recorded} of ${set.needed} coupons`}.</span> {set.message}{' '}
          <span className="whitespace-nowrap rounded bg-white px-1 text-xs font-semibold">{set.clause}</span>
        </p>
      )}
    </Part>
  );
}
