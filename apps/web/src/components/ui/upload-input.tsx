// Attach one file: the upload starts as soon as the file is chosen, and the field then shows what was
// stored (name, size, a thumbnail for images) with a way to remove it from this form.
import type { Upload } from '@beadroll/rules';
import { useId } from 'react';
import { ApiError, errorMessage } from '@/lib/api-client';
import { uploadContentUrl, useUploadFile, type UploadKind } from '@/lib/uploads';
import { Button } from './button';
import { FieldError } from './field';
import { Spinner } from './spinner';

export const ACCEPTED_FILES = 'image/jpeg,image/png,image/webp,image/heic,image/heif,application/pdf';

export function formatBytes(size: number): string {
  if (size < 1024) return `${size} B`;
  if (size < 1024 * 1024) return `${(size / 1024).toFixed(1)} KB`;
  return `${(size / 1024 / 1024).toFixed(1)} MB`;
}

interface UploadInputProps {
  label: string;
  kind: UploadKind;
  value: Upload | null;
  onChange: (upload: Upload | null) => void;
  error?: string;
  hint?: string;
}

export function UploadInput({ label, kind, value, onChange, error, hint }: UploadInputProps) {
  const id = useId();
  const upload = useUploadFile();
  const uploadError =
    upload.error instanceof ApiError ? (upload.error.fields.file ?? upload.error.message) : upload.error ? errorMessage(upload.error) : undefined;
  const shown = error ?? uploadError;

  return (
    <div>
      <label htmlFor={id} className="mb-1 block text-sm font-semibold text-stone-800">
        {label}
      </label>
      {value ? (
        <div className="flex flex-wrap items-center gap-3 rounded-md border border-stone-200 bg-stone-50 px-3 py-2">
          {value.contentType.startsWith('image/') && (
            <img src={uploadContentUrl(value.id, true)} alt={`${label}: ${value.fileName}`} className="size-14 rounded object-cover ring-1 ring-stone-200" />
          )}
          <a href={uploadContentUrl(value.id)} className="min-w-0 flex-1 truncate text-sm font-semibold text-accent-700 underline" download={value.fileName}>
            {value.fileName}
          </a>
          <span className="text-xs text-stone-500">{formatBytes(value.size)}</span>
          <Button size="row" variant="ghost" onClick={() => onChange(null)} aria-label={`Remove ${value.fileName} from ${label}`}>
            Remove
          </Button>
        </div>
      ) : (
        <div className="flex items-center gap-2">
          <input
            id={id}
            type="file"
            accept={ACCEPTED_FILES}
            aria-invalid={shown ? true : undefined}
            aria-describedby={shown ? `${id}-error` : hint ? `${id}-hint` : undefined}
            disabled={upload.isPending}
            className="block w-full text-sm file:mr-3 file:min-h-9 file:rounded-md file:border-0 file:bg-stone-200 file:px-3 file:font-semibold file:text-stone-800 hover:file:bg-stone-300"
            onChange={(e) => {
              const file = e.target.files?.[0];
              e.target.value = '';
              if (!file) return;
              upload.mutate({ file, kind }, { onSuccess: (stored) => onChange(stored) });
            }}
          />
          {upload.isPending && (
            <span role="status" className="flex items-center gap-1 text-sm text-stone-600">
              <Spinner className="size-4" /> Uploading…
            </span>
          )}
        </div>
      )}
      {hint && !shown && (
        <p id={`${id}-hint`} className="mt-1 text-xs text-stone-500">
          {hint}
        </p>
      )}
      <FieldError id={`${id}-error`} message={shown} />
    </div>
  );
}
