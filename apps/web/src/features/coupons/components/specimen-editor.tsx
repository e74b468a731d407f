// One bend specimen: its kind, the discontinuities seen after bending (size as typed, location, type,
// whether slag or another fusion cause is visible) and a photo of the bent specimen.
import { discontinuityTypes, lengthBounds, type Upload } from '@beadroll/rules';
import { Button } from '@/components/ui/button';
import { Checkbox, SelectField } from '@/components/ui/field';
import { PlusIcon } from '@/components/ui/icons';
import { UploadInput } from '@/components/ui/upload-input';
import {
  errorFor,
  newDiscontinuity,
  specimenLabel,
  type DiscontinuityDraft,
  type Errors,
  type SpecimenDraft,
  type SpecimenKind,
} from '../model/coupon-draft';
import { SizeField } from '@/components/ui/size-field';

const typeWords: Record<(typeof discontinuityTypes)[number], string> = {
  crack: 'Crack',
  porosity: 'Porosity',
  slag: 'Slag',
  'lack-of-fusion': 'Lack of fusion',
  undercut: 'Undercut',
  tear: 'Tear',
  other: 'Other',
};

interface SpecimenEditorProps {
  specimen: SpecimenDraft;
  index: number;
  errors: Errors;
  onChange: (next: SpecimenDraft, changedPath?: string) => void;
  onRemove: () => void;
  /** The key of a discontinuity just added, to put the cursor in its size field. */
  focusKey: string | null;
  onAdded: (key: string) => void;
}

export function SpecimenEditor({
  specimen,
  index,
  errors,
  onChange,
  onRemove,
  focusKey,
  onAdded,
}: SpecimenEditorProps) {
  const name = specimenLabel(specimen, index);
  const at = `examination.bend.specimens.${index}`;
  const setDisc = (j: number, change: Partial<DiscontinuityDraft>) =>
    onChange(
      {
        ...specimen,
        discontinuities: specimen.discontinuities.map((d, k) => (k === j ? { ...d, ...change } : d)),
      },
      `${at}.discontinuities.${j}`,
    );
  const add = () => {
    const d = newDiscontinuity();
    onChange({ ...specimen, discontinuities: [...specimen.discontinuities, d] });
    onAdded(d.key);
  };

  return (
    <fieldset className="rounded-lg border border-stone-200 bg-white p-3" aria-label={name}>
      <legend className="px-1 text-sm font-bold text-stone-800">{name}</legend>
      <div className="flex flex-wrap items-end gap-3">
        <SelectField
          label={
            <>
              Kind<span className="sr-only"> of {name}</span>
            </>
          }
          value={specimen.kind}
          wrapperClassName="w-40"
          onChange={(e) => onChange({ ...specimen, kind: e.target.value as SpecimenKind }, `${at}.kind`)}
          error={errorFor(errors, `${at}.kind`)}
        >
          <option value="face">Face bend</option>
          <option value="root">Root bend</option>
          <option value="side">Side bend</option>
        </SelectField>
        <div className="pb-1">
          <Checkbox
            label="Examined"
            aria-label={`${name} examined`}
            checked={specimen.examined}
            onChange={(e) => onChange({ ...specimen, examined: e.target.checked }, `${at}.examined`)}
          />
          {errorFor(errors, `${at}.examined`) && <p className="text-sm text-red-700">{errorFor(errors, `${at}.examined`)}</p>}
        </div>
        <Button variant="ghost" onClick={onRemove} aria-label={`Remove ${name}`}>
          Remove specimen
        </Button>
      </div>

      <div className="mt-3 space-y-2">
        {specimen.discontinuities.length === 0 && (
          <p className="text-sm text-stone-600">No discontinuities recorded: the specimen bent clean.</p>
        )}
        {specimen.discontinuities.map((d, j) => {
          const dn = `${name}, discontinuity ${j + 1}`;
          const dAt = `${at}.discontinuities.${j}`;
          return (
            <div
              key={d.key}
              role="group"
              aria-label={dn}
              className="grid items-start gap-x-3 gap-y-1 rounded-md bg-stone-50 p-2 sm:grid-cols-3"
            >
              <SizeField
                label={
                  <>
                    Size<span className="sr-only"> of {dn}</span>
                  </>
                }
                value={d.sizeText}
                bounds={lengthBounds.discontinuity}
                autoFocus={focusKey === d.key}
                onChange={(sizeText) => setDisc(j, { sizeText })}
                onEnter={add}
                error={errorFor(errors, `${dAt}.sizeText`) ?? errorFor(errors, `${dAt}.size`)}
              />
              <SelectField
                label={
                  <>
                    Location<span className="sr-only"> of {dn}</span>
                  </>
                }
                value={d.location}
                onChange={(e) => setDisc(j, { location: e.target.value as 'surface' | 'corner' })}
                error={errorFor(errors, `${dAt}.location`)}
              >
                <option value="surface">Surface</option>
                <option value="corner">Corner (at the edge)</option>
              </SelectField>
              <SelectField
                label={
                  <>
                    Type<span className="sr-only"> of {dn}</span>
                  </>
                }
                value={d.type}
                onChange={(e) => setDisc(j, { type: e.target.value as DiscontinuityDraft['type'] })}
                error={errorFor(errors, `${dAt}.type`)}
              >
                <option value="">Not stated</option>
                {discontinuityTypes.map((t) => (
                  <option key={t} value={t}>
                    {typeWords[t]}
                  </option>
                ))}
              </SelectField>
              <div className="flex flex-wrap items-center justify-between gap-2 sm:col-span-3">
                <Checkbox
                  label="Slag or other fusion cause visible"
                  aria-label={`Slag or other fusion cause visible on ${dn}`}
                  checked={d.fusionRelated}
                  onChange={(e) => setDisc(j, { fusionRelated: e.target.checked })}
                />
                <Button
                  variant="ghost"
                  aria-label={`Remove ${dn}`}
                  onClick={() =>
                    onChange(
                      { ...specimen, discontinuities: specimen.discontinuities.filter((_, k) => k !== j) },
                      `${at}.discontinuities`,
                    )
                  }
                >
                  Remove
                </Button>
              </div>
            </div>
          );
        })}
        <Button onClick={add}>
          <PlusIcon /> Add a discontinuity to {name}
        </Button>
      </div>

      <div className="mt-3">
        <UploadInput
          label={`Photo of ${name}`}
          kind="specimen-photo"
          value={specimen.photo}
          onChange={(photo: Upload | null) => onChange({ ...specimen, photo }, `${at}.photoUploadId`)}
          error={errorFor(errors, `${at}.photoUploadId`)}
          hint="JPEG, PNG, WebP or HEIC, up to 15 MB."
        />
      </div>
    </fieldset>
  );
}
