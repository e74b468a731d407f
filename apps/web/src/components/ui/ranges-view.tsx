// What a qualification (or a coupon about to be certified) lets the welder weld, in plain words, with
// the clause behind every limit and the standing caution that the code, the manual and the inspector govern.
import { displayName, formatLength, weldingPositionNames, type Interval, type Length, type QualifiedRanges } from '@beadroll/rules';
import { z } from 'zod';

const lengthView = z.object({ value: z.number(), unit: z.enum(['in', 'mm']) });
const intervalView = z.object({
  min: lengthView.nullable(),
  max: lengthView.nullable(),
  minExclusive: z.boolean().optional().default(false),
  maxExclusive: z.boolean().optional().default(false),
});

/** The stored ranges of a certified qualification, read back (they are kept as JSON by the API). */
export const rangesViewSchema = z.object({
  positions: z.object({ groove: z.array(z.string()), fillet: z.array(z.string()) }),
  thickness: intervalView,
  diameter: intervalView,
  fNumbers: z.array(z.number()),
  fNumberBacking: z.array(z.object({ fNumber: z.number(), backing: z.array(z.string()) })).optional().default([]),
  backing: z.array(z.string()),
  progression: z.array(z.string()).nullable(),
  transferModes: z.array(z.string()).nullable().optional(),
  limits: z.array(z.object({ variable: z.string(), clause: z.string(), text: z.string(), source: z.string() })),
  notice: z.string().optional(),
});
export type RangesView = z.output<typeof rangesViewSchema>;

const show = (l: Length) => formatLength(l, { digits: l.unit === 'mm' ? 1 : 3 });

/** '1/8 in to 3/4 in', '2-7/8 in and over', 'up to 1.1 in', 'any (no limit from this code)'. */
export function intervalWords(i: Pick<Interval, 'min' | 'max' | 'minExclusive' | 'maxExclusive'>, suffix = ''): string {
  const s = suffix ? ` ${suffix}` : '';
  if (!i.min && !i.max) return 'Any (no limit from this code)';
  if (i.min && i.max)
    return `${i.minExclusive ? 'over ' : ''}${show(i.min)} to ${i.maxExclusive ? 'under ' : ''}${show(i.max)}${s}`;
  if (i.min) return `${i.minExclusive ? 'Over' : ''} ${show(i.min)}${s} and over`.trim().replace(/^(\S)/, (c) => c.toUpperCase());
  return `${i.maxExclusive ? 'Under' : 'Up to'} ${show(i.max as Length)}${s}`;
}

const positionWords = (list: string[]): string =>
  list.length === 0
    ? 'None'
    : `${list.join(', ')} (${list.map((p) => weldingPositionNames[p as keyof typeof weldingPositionNames] ?? p).join(', ')})`;

const VARIABLE_WORDS: Record<string, string> = {
  positions: 'Positions',
  thickness: 'Thickness',
  diameter: 'Pipe diameter',
  fNumber: 'Filler (F-No.)',
  backing: 'Backing',
  progression: 'Progression',
  transferMode: 'Transfer mode',
};

/** The ranges as label/value lines, for the screens and the tests alike. */
export function rangeLines(r: RangesView | QualifiedRanges): Array<{ label: string; value: string }> {
  const lines = [
    { label: 'Groove positions', value: positionWords(r.positions.groove) },
    { label: 'Fillet positions', value: positionWords(r.positions.fillet) },
    { label: 'Thickness', value: intervalWords(r.thickness) },
    { label: 'Pipe diameter', value: intervalWords(r.diameter, 'OD') },
    {
      label: 'Filler (F-No.)',
      value:
        r.fNumbers.length === 0
          ? 'No filler metal qualified'
          : r.fNumberBacking.length > 0
            ? r.fNumberBacking.map((f) => `F-No. ${f.fNumber} ${f.backing.join(' or ')} backing`).join('; ')
            : r.fNumbers.map((f) => `F-No. ${f}`).join(', '),
    },
    { label: 'Backing', value: r.backing.includes('without') ? 'With and without backing' : 'With backing only' },
    { label: 'Vertical progression', value: r.progression ? `${r.progression.join(', ')} only` : 'Does not apply' },
  ];
  if (r.transferModes) lines.push({ label: 'Transfer mode', value: r.transferModes.join(', ') });
  return lines;
}

export const RANGES_CAUTION =
  'Computed by Beadroll from the coupon; the code edition in force, the company’s quality manual and the responsible inspector govern. Each limit names its clause.';

/**
 * `showSources`: the QA manager also sees where each limit's value comes from (published, from memory,
 * common practice) in a details view; welders, foremen and the public see the clause only.
 */
export function RangesView({
  ranges,
  heading = 'Qualified ranges',
  showSources = false,
}: {
  ranges: RangesView | QualifiedRanges;
  heading?: string;
  showSources?: boolean;
}) {
  return (
    <div>
      <h3 className="text-sm font-bold text-stone-800">{heading}</h3>
      <dl className="mt-1 grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[10rem_minmax(0,1fr)]">
        {rangeLines(ranges).map((line) => (
          <div key={line.label} className="contents">
            <dt className="font-semibold text-stone-600">{line.label}</dt>
            <dd className="text-stone-900">{line.value}</dd>
          </div>
        ))}
      </dl>
      <h4 className="mt-3 text-xs font-bold uppercase tracking-wide text-stone-600">Limits and their clauses</h4>
      <ul className="mt-1 space-y-1 text-sm">
        {ranges.limits.map((limit, i) => (
          <li key={i} className="flex flex-wrap items-baseline gap-x-2">
            <span className="text-xs font-semibold text-stone-500">{VARIABLE_WORDS[limit.variable] ?? limit.variable}</span>
            <span className="text-stone-900">{limit.text}</span>
            <span className="rounded bg-stone-100 px-1.5 text-xs font-semibold text-stone-700">{limit.clause}</span>
          </li>
        ))}
      </ul>
      {showSources && (
        <details className="mt-2 text-xs text-stone-700">
          <summary className="cursor-pointer font-semibold text-stone-600">Where each limit&rsquo;s value comes from</summary>
          <ul className="mt-1 space-y-0.5">
            {ranges.limits.map((limit, i) => (
              <li key={i}>
                {limit.clause}: {displayName('sourceKinds', limit.source)}
              </li>
            ))}
          </ul>
        </details>
      )}
      <p className="mt-2 text-xs text-stone-600">{ranges.notice ?? RANGES_CAUTION}</p>
    </div>
  );
}
