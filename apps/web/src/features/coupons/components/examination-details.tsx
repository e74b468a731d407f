// A recorded coupon's examination, part by part as the server judged it: the visual examination and its
// findings, then the bends, radiography or ultrasonics, fillet break and macro-etch, nick-breaks, the
// processes of a combination coupon and the retest link — each with its verdict, the clause behind every
// reason, and what was recorded.
import { formatLengthBoth, type CouponRecord, type EvaluationPart, type Length } from '@beadroll/rules';
import type { ReactNode } from 'react';
import { StatusChip } from '@/components/ui/status-chip';
import { uploadContentUrl } from '@/lib/uploads';
import { INDICATION_WORDS, PART_NAMES, RETEST_BASIS_WORDS, VISUAL_FINDING_WORDS } from '../model/examination-words';

type Ex = CouponRecord['examination'];
const size = (l: Length) => formatLengthBoth(l);
const yesNo = (b: boolean | undefined) => (b ? 'yes' : 'no');

function Reasons({ reasons, tone = 'bad' }: { reasons: { clause: string; message: string }[]; tone?: 'bad' | 'note' }) {
  if (reasons.length === 0) return null;
  return (
    <ul className="mt-1 space-y-1 text-sm">
      {reasons.map((r, k) => (
        <li key={k} className={tone === 'bad' ? 'text-red-800' : 'text-stone-700'}>
          {r.message} <span className="rounded bg-stone-100 px-1 text-xs font-semibold text-stone-800">{r.clause}</span>
        </li>
      ))}
    </ul>
  );
}

function Facts({ rows }: { rows: Array<[string, ReactNode]> }) {
  return (
    <dl className="mt-1 grid grid-cols-[12rem_minmax(0,1fr)] gap-x-2 gap-y-1 text-sm">
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-stone-600">{k}</dt>
          <dd>{v}</dd>
        </div>
      ))}
    </dl>
  );
}

function Bends({ ex }: { ex: Ex }) {
  const specimens = ex.bend?.specimens ?? [];
  return (
    <div className="mt-2 space-y-3">
      {specimens.map((s, i) => (
        <div key={i} className="rounded-md border border-stone-200 p-3">
          <div className="flex flex-wrap items-center gap-2">
            <h4 className="font-semibold">{s.label ?? `Specimen ${i + 1}`}</h4>
            <span className="text-sm text-stone-600">{s.kind} bend</span>
            <StatusChip status={`coupon.${s.result}`} />
          </div>
          <div className="mt-2 flex flex-wrap gap-4">
            {s.photo && (
              <a href={uploadContentUrl(s.photo.id, true)} target="_blank" rel="noreferrer">
                <img src={uploadContentUrl(s.photo.id, true)} alt={`Photo of ${s.label ?? `specimen ${i + 1}`}`} className="h-24 w-32 rounded object-cover ring-1 ring-stone-200" />
              </a>
            )}
            <div className="min-w-0 flex-1 text-sm">
              {s.discontinuities.length === 0 ? (
                <p className="text-stone-600">No discontinuities recorded.</p>
              ) : (
                <ul className="list-disc pl-5">
                  {s.discontinuities.map((d, j) => (
                    <li key={j}>
                      {size(d.size)}
                      {d.sizeText.replace(/\s+/g, '') !== size(d.size).split(' (')[0]?.replace(/\s+/g, '') ? ` (typed “${d.sizeText}”)` : ''} · {d.location}
                      {d.type ? ` · ${d.type.replace(/-/g, ' ')}` : ''}
                      {d.fusionRelated ? ' · fusion cause visible' : ''}
                    </li>
                  ))}
                </ul>
              )}
              <Reasons reasons={s.reasons} />
            </div>
          </div>
        </div>
      ))}
    </div>
  );
}

function Recorded({ kind, ex }: { kind: EvaluationPart['kind']; ex: Ex }) {
  switch (kind) {
    case 'bend':
      return <Bends ex={ex} />;
    case 'radiography':
    case 'ultrasonic': {
      const v = ex.volumetric;
      if (!v) return null;
      return (
        <>
          <Facts
            rows={[
              ['Report number', v.reportNumber || '—'],
              [
                'Report',
                v.report ? (
                  <a className="font-semibold text-accent-700 underline" href={uploadContentUrl(v.report.id)} download={v.report.fileName}>
                    {v.report.fileName}
                  </a>
                ) : (
                  'None attached'
                ),
              ],
              ["Examiner's verdict", v.examinerResult ? (v.examinerResult === 'accept' ? 'Accept' : 'Reject') : 'Not recorded'],
            ]}
          />
          {v.indications.length === 0 ? (
            <p className="mt-1 text-sm text-stone-600">No indications recorded.</p>
          ) : (
            <ul className="mt-1 list-disc pl-5 text-sm">
              {v.indications.map((d, j) => (
                <li key={j}>
                  {INDICATION_WORDS[d.type]}, {size(d.size)}
                  {d.width ? `, ${size(d.width)} wide` : ''}
                </li>
              ))}
            </ul>
          )}
        </>
      );
    }
    case 'fillet-break': {
      const b = ex.filletBreak;
      if (!b) return null;
      return (
        <Facts
          rows={[
            ['Bent flat without fracture', yesNo(b.bentFlat)],
            ['Crack on the fracture', yesNo(b.crack)],
            ['Incomplete root fusion', yesNo(b.incompleteRootFusion)],
            ['Inclusions and pores', b.inclusions?.length ? b.inclusions.map(size).join('; ') : 'none recorded'],
          ]}
        />
      );
    }
    case 'macro-etch': {
      const m = ex.macroEtch;
      if (!m) return null;
      return (
        <Facts
          rows={[
            ['Complete fusion', yesNo(m.completeFusion)],
            ['Crack', yesNo(m.crack)],
            ['Fillet legs', m.legs ? m.legs.map(size).join(' and ') : 'not measured'],
            ['Convexity', m.convexity ? size(m.convexity) : '—'],
            ['Concavity', m.concavity ? size(m.concavity) : '—'],
            ...(m.specifiedSize ? ([['Specified fillet size', size(m.specifiedSize)]] as Array<[string, ReactNode]>) : []),
          ]}
        />
      );
    }
    case 'nick-break':
      return (
        <ul className="mt-1 space-y-1 text-sm">
          {(ex.nickBreak?.specimens ?? []).map((s, i) => (
            <li key={i}>
              <span className="font-semibold">{s.id ?? `Nick-break ${i + 1}`}</span>: penetration and fusion{' '}
              {s.completePenetrationAndFusion ? 'complete' : 'not complete'}
              {s.gasPockets?.length ? `; gas pockets ${s.gasPockets.map(size).join(', ')}` : ''}
              {s.gasPocketAreaPercent !== undefined ? `; gas pockets ${s.gasPocketAreaPercent} % of the area` : ''}
              {s.slagInclusions?.length
                ? `; slag ${s.slagInclusions.map((x) => `${size(x.length)} long, ${size(x.depth)} deep`).join('; ')}`
                : ''}
            </li>
          ))}
        </ul>
      );
    case 'combination':
      return (
        <ul className="mt-1 list-disc pl-5 text-sm">
          {(ex.layers ?? []).map((l, i) => (
            <li key={i}>
              {i === 0 ? 'Root: ' : 'Then: '}
              {l.process}, {size(l.depositedThickness)} deposited
              {l.withoutFiller ? ', without filler metal' : l.fNumber ? `, F-No. ${l.fNumber}` : ''}
            </li>
          ))}
        </ul>
      );
    case 'retest':
      return ex.retest ? (
        <Facts
          rows={[
            ['Retest of', ex.retest.of],
            ['Kind', RETEST_BASIS_WORDS[ex.retest.basis]],
            ...(ex.retest.failedOn ? ([['Failed test of', ex.retest.failedOn]] as Array<[string, ReactNode]>) : []),
          ]}
        />
      ) : null;
    default:
      return null;
  }
}

/** Every part of a recorded coupon's examination with the server's verdict on it. */
export function ExaminationDetails({ coupon }: { coupon: CouponRecord }) {
  const ex = coupon.examination;
  const parts: EvaluationPart[] =
    coupon.evaluation?.parts ??
    // coupons recorded before the evaluation was stored: what was recorded, without part verdicts
    ([
      { kind: 'visual', result: coupon.visual, criteria: [], reasons: [], notes: [] },
      ...(ex.bend ? [{ kind: 'bend', result: coupon.result, criteria: [], reasons: [], notes: [] }] : []),
      ...(ex.volumetric ? [{ kind: ex.volumetric.method, result: coupon.result, criteria: [], reasons: [], notes: [] }] : []),
    ] as EvaluationPart[]);
  return (
    <div className="space-y-4">
      {parts.map((p, i) => (
        <section key={i} aria-label={PART_NAMES[p.kind]} className="border-t border-stone-100 pt-3 first:border-0 first:pt-0">
          <div className="flex flex-wrap items-center gap-2">
            <h3 className="font-semibold">{PART_NAMES[p.kind]}</h3>
            <StatusChip status={`coupon.${p.result}`} />
            {p.criteria[0] && (
              <span className="text-xs text-stone-600">
                judged by {p.criteria.map((c) => `${c.name} (${c.clause})`).join(', then in addition ')}
              </span>
            )}
          </div>
          {p.kind === 'visual' && (
            <>
              {coupon.visualFindings.length === 0 ? (
                <p className="mt-1 text-sm text-stone-600">No findings recorded.</p>
              ) : (
                <ul className="mt-1 list-disc pl-5 text-sm">
                  {coupon.visualFindings.map((f, j) => (
                    <li key={j}>
                      {VISUAL_FINDING_WORDS[f.type]}
                      {f.size ? `, ${size(f.size)}` : ''}
                      {f.note ? ` — ${f.note}` : ''}
                    </li>
                  ))}
                </ul>
              )}
            </>
          )}
          <Recorded kind={p.kind} ex={ex} />
          {p.kind !== 'bend' && <Reasons reasons={p.reasons} />}
          <Reasons reasons={p.notes} tone="note" />
        </section>
      ))}
    </div>
  );
}
