// Pipe by NPS and schedule: the outside diameter and nominal wall come from ASME B36.10M (pipeDimensions).
import { formatLengthBoth } from '@beadroll/rules';
import { TextField } from '@/components/ui/field';
import { errorFor, pipeFill, type Errors } from '../model/coupon-draft';

interface PipeSizeFieldsProps {
  nps: string;
  schedule: string;
  onChange: (change: { nps?: string; schedule?: string }) => void;
  errors: Errors;
}

export function PipeSizeFields({ nps, schedule, onChange, errors }: PipeSizeFieldsProps) {
  const fill = pipeFill(nps, schedule);
  const own = fill && !fill.ok ? fill.errors : {};
  return (
    <div className="grid gap-3 sm:grid-cols-2">
      <TextField
        label="NPS"
        value={nps}
        placeholder="2, 1-1/4, 6"
        autoComplete="off"
        onChange={(e) => onChange({ nps: e.target.value })}
        error={own['pipe.nps'] ?? errorFor(errors, 'pipe.nps')}
      />
      <TextField
        label="Schedule"
        value={schedule}
        placeholder="40, 80, XS"
        autoComplete="off"
        onChange={(e) => onChange({ schedule: e.target.value })}
        error={own['pipe.schedule'] ?? errorFor(errors, 'pipe.schedule')}
      />
      <output aria-label="Pipe dimensions" className="rounded-md bg-stone-50 px-3 py-2 text-sm text-stone-800 sm:col-span-2" aria-live="polite">
        {fill?.ok ? (
          <>
            Outside diameter <strong>{formatLengthBoth(fill.outsideDiameter)}</strong> · wall <strong>{formatLengthBoth(fill.wall)}</strong>{' '}
            <span className="text-xs text-stone-500">(ASME B36.10M nominal)</span>
          </>
        ) : (
          <span className="text-stone-500">Enter NPS and schedule to fill the outside diameter and wall.</span>
        )}
      </output>
      {errorFor(errors, 'coupon.thickness') && <p className="text-sm text-red-700 sm:col-span-2">Wall: {errorFor(errors, 'coupon.thickness')}</p>}
    </div>
  );
}
