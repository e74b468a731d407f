// Modal dialogs on the native <dialog> element: it traps focus, closes on Escape and returns focus to
// the button that opened it. ConfirmDialog guards every destructive action.
import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from './button';
import { FormError } from './field';

interface DialogProps {
  open: boolean;
  onClose: () => void;
  title: ReactNode;
  description?: ReactNode;
  children: ReactNode;
  size?: 'sm' | 'md' | 'lg';
}

const widths = { sm: 'sm:max-w-md', md: 'sm:max-w-lg', lg: 'sm:max-w-2xl' };

export function Dialog({ open, onClose, title, description, children, size = 'md' }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const descriptionId = useId();

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      aria-describedby={description ? descriptionId : undefined}
      onCancel={(event) => {
        event.preventDefault();
        onClose();
      }}
      className={`m-auto w-full max-w-[calc(100%-1.5rem)] rounded-lg bg-white p-0 text-stone-900 shadow-xl ${widths[size]}`}
    >
      {open && (
        <div className="p-5">
          <h2 id={titleId} className="text-lg font-bold">
            {title}
          </h2>
          {description && (
            <div id={descriptionId} className="mt-1 text-sm text-stone-600">
              {description}
            </div>
          )}
          <div className="mt-4">{children}</div>
        </div>
      )}
    </dialog>
  );
}

export function DialogActions({ children }: { children: ReactNode }) {
  return <div className="mt-5 flex flex-col-reverse gap-2 sm:flex-row sm:justify-end">{children}</div>;
}

interface ConfirmDialogProps {
  open: boolean;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  onConfirm: () => void;
  onCancel: () => void;
  busy?: boolean;
  error?: string;
  tone?: 'danger' | 'primary';
}

export function ConfirmDialog({ open, title, children, confirmLabel, onConfirm, onCancel, busy, error, tone = 'danger' }: ConfirmDialogProps) {
  return (
    <Dialog open={open} onClose={onCancel} title={title} description={children} size="sm">
      <FormError message={error} />
      <DialogActions>
        <Button onClick={onCancel} disabled={busy}>
          Cancel
        </Button>
        <Button variant={tone} onClick={onConfirm} busy={busy}>
          {confirmLabel}
        </Button>
      </DialogActions>
    </Dialog>
  );
}
