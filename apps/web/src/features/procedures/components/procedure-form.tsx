// Add or edit a WPS of the register. Lengths are typed as the WPS writes them (3/16, 1-1/2 in, 5 mm);
// the body is checked with the register's own schema before it is sent, and the server's 400 lands on
// the same fields. Editing sends the version it started from: a 409 says plainly that someone else saved.
import {
  fieldsOf,
  formatLength,
  procedureInput,
  procedureUpdateInput,
  processes,
  weldingPositionNames,
  weldingPositions,
  type Procedure,
  type ProcedureInput,
  type Upload,
} from '@beadroll/rules';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { DialogActions } from '@/components/ui/dialog';
import { Checkbox, CheckboxGroup, FormError, SelectField, TextField } from '@/components/ui/field';
import { SizeField } from '@/components/ui/size-field';
import { readLength } from '@/lib/lengths';
import { UploadInput } from '@/components/ui/upload-input';
import { ApiError, errorMessage } from '@/lib/api-client';
import { useCreateProcedure, useUpdateProcedure } from '../api/save-procedure';

export const PROCEDURE_CONFLICT_MESSAGE = 'Someone else changed this WPS since you opened it. Close this form and open it again to see their change.';

const codeOptions = [
  ['asme-ix', 'ASME IX'],
  ['aws-d1.1', 'AWS D1.1'],
  ['api-1104', 'API 1104'],
  ['iso-9606-1', 'ISO 9606-1'],
] as const;

type Errors = Record<string, string>;

interface Values {
  number: string;
  revision: string;
  code: string;
  processes: string[];
  pNumbers: string;
  fNumber: string;
  positions: string[];
  thicknessMin: string;
  thicknessMax: string;
  document: Upload | null;
  notes: string;
}

const valuesOf = (p?: Procedure): Values => ({
  number: p?.number ?? '',
  revision: p?.revision ?? '',
  code: p?.code ?? '',
  processes: p?.processes ?? [],
  pNumbers: p?.pNumbers.join(', ') ?? '',
  fNumber: p?.fNumber?.toString() ?? '',
  positions: p?.positions ?? [],
  thicknessMin: p?.thicknessMin ? formatLength(p.thicknessMin) : '',
  thicknessMax: p?.thicknessMax ? formatLength(p.thicknessMax) : '',
  document: p?.document ?? null,
  notes: p?.notes ?? '',
});

function toBody(v: Values): { body: Record<string, unknown>; errors: Errors } {
  const errors: Errors = {};
  const length = (key: 'thicknessMin' | 'thicknessMax') => {
    const read = readLength(v[key], { positive: true });
    if (read === null) return null;
    if (!read.ok) {
      errors[key] = read.error;
      return null;
    }
    return { value: read.length.value, unit: read.length.unit };
  };
  const fNumber = v.fNumber.trim() === '' ? null : Number(v.fNumber);
  return {
    body: {
      number: v.number,
      revision: v.revision,
      code: v.code || undefined,
      processes: v.processes,
      pNumbers: v.pNumbers.split(/[,;]/).map((p) => p.trim()).filter(Boolean),
      fNumber,
      positions: v.positions,
      thicknessMin: length('thicknessMin'),
      thicknessMax: length('thicknessMax'),
      documentUploadId: v.document?.id ?? null,
      notes: v.notes,
    },
    errors,
  };
}

const toggle = (list: string[], item: string, on: boolean) => (on ? [...new Set([...list, item])] : list.filter((x) => x !== item));

export function ProcedureForm({ procedure, onDone, onCancel }: { procedure?: Procedure; onDone: (p: Procedure) => void; onCancel: () => void }) {
  const create = useCreateProcedure();
  const update = useUpdateProcedure();
  const [values, setValues] = useState<Values>(() => valuesOf(procedure));
  const [errors, setErrors] = useState<Errors>({});
  const [formError, setFormError] = useState<string>();
  const [conflict, setConflict] = useState(false);
  const set = (change: Partial<Values>, ...keys: string[]) => {
    setValues((v) => ({ ...v, ...change }));
    setErrors((e) => Object.fromEntries(Object.entries(e).filter(([k]) => !keys.some((key) => k === key || k.startsWith(`${key}.`)))));
  };
  const err = (key: string) => errors[key] ?? Object.entries(errors).find(([k]) => k.startsWith(`${key}.`))?.[1];

  const onError = (error: unknown) => {
    if (error instanceof ApiError && error.status === 409) {
      setConflict(true);
      setFormError(PROCEDURE_CONFLICT_MESSAGE);
    } else if (error instanceof ApiError && Object.keys(error.fields).length > 0) {
      setErrors(error.fields);
      setFormError(error.message);
    } else setFormError(errorMessage(error));
  };

  const submit = () => {
    setFormError(undefined);
    const { body, errors: own } = toBody(values);
    const parsed = procedure ? procedureUpdateInput.safeParse({ ...body, version: procedure.version }) : procedureInput.safeParse(body);
    const found = { ...(parsed.success ? {} : fieldsOf(parsed.error)), ...own };
    if (Object.keys(found).length > 0) {
      setErrors(found);
      return;
    }
    if (procedure) update.mutate({ id: procedure.id, input: { ...(body as Partial<ProcedureInput>), version: procedure.version } }, { onSuccess: onDone, onError });
    else create.mutate(body as ProcedureInput, { onSuccess: onDone, onError });
  };

  return (
    <form
      noValidate
      className="grid gap-3 sm:grid-cols-2"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
    >
      <TextField label="WPS number" autoFocus value={values.number} error={err('number')} onChange={(e) => set({ number: e.target.value }, 'number')} />
      <TextField label="Revision" value={values.revision} error={err('revision')} onChange={(e) => set({ revision: e.target.value }, 'revision')} />
      <SelectField label="Code" value={values.code} error={err('code')} onChange={(e) => set({ code: e.target.value }, 'code')}>
        <option value="">Choose the code…</option>
        {codeOptions.map(([id, name]) => (
          <option key={id} value={id}>
            {name}
          </option>
        ))}
      </SelectField>
      <TextField label="F-No." inputMode="numeric" value={values.fNumber} error={err('fNumber')} onChange={(e) => set({ fNumber: e.target.value }, 'fNumber')} hint="Filler metal F-Number; empty if none." />
      <CheckboxGroup legend="Processes" error={err('processes')}>
        <div className="flex flex-wrap gap-x-4">
          {processes.map((p) => (
            <Checkbox key={p} label={p} checked={values.processes.includes(p)} onChange={(e) => set({ processes: toggle(values.processes, p, e.target.checked) }, 'processes')} />
          ))}
        </div>
      </CheckboxGroup>
      <CheckboxGroup legend="Positions" error={err('positions')}>
        <div className="flex flex-wrap gap-x-4">
          {weldingPositions.map((p) => (
            <Checkbox key={p} label={`${p} (${weldingPositionNames[p]})`} checked={values.positions.includes(p)} onChange={(e) => set({ positions: toggle(values.positions, p, e.target.checked) }, 'positions')} />
          ))}
        </div>
      </CheckboxGroup>
      <TextField label="Base metal P-Nos." value={values.pNumbers} error={err('pNumbers')} placeholder="1, or 8, 1" onChange={(e) => set({ pNumbers: e.target.value }, 'pNumbers')} />
      <div className="grid grid-cols-2 gap-3">
        <SizeField label="Thickness from" positive value={values.thicknessMin} error={err('thicknessMin')} onChange={(t) => set({ thicknessMin: t }, 'thicknessMin')} placeholder="3/16" />
        <SizeField label="Thickness to" positive value={values.thicknessMax} error={err('thicknessMax')} onChange={(t) => set({ thicknessMax: t }, 'thicknessMax')} placeholder="3/4" />
      </div>
      <div className="sm:col-span-2">
        <UploadInput label="WPS document" kind="wps-document" value={values.document} error={err('documentUploadId')} onChange={(document) => set({ document }, 'documentUploadId')} hint="The signed WPS as a PDF (or a scan as an image), up to 15 MB." />
      </div>
      <TextField label="Notes" wrapperClassName="sm:col-span-2" value={values.notes} error={err('notes')} onChange={(e) => set({ notes: e.target.value }, 'notes')} />
      <div className="sm:col-span-2">
        <FormError message={formError} />
        <DialogActions>
          <Button onClick={onCancel}>{conflict ? 'Close' : 'Cancel'}</Button>
          <Button type="submit" variant="primary" busy={create.isPending || update.isPending} disabled={conflict}>
            {procedure ? 'Save changes' : 'Add WPS'}
          </Button>
        </DialogActions>
      </div>
    </form>
  );
}
