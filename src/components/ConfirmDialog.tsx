import type { ReactNode } from 'react';
import { Button } from './Button';
import { Dialog, DialogActions } from './Dialog';
import { Notice } from './Notice';
import { errorMessage } from '@/lib/api';

/** Confirms a destructive action; the confirm button is not focused first, so Enter never destroys by accident. */
export function ConfirmDialog({
  open,
  onClose,
  onConfirm,
  title,
  children,
  confirmLabel,
  pending,
  error,
}: {
  open: boolean;
  onClose: () => void;
  onConfirm: () => void;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  pending: boolean;
  error?: unknown;
}) {
  return (
    <Dialog open={open} onClose={onClose} title={title}>
      <div className="space-y-3 text-sm text-graphite-700">
        {children}
        {error ? <Notice signal="error">{errorMessage(error)}</Notice> : null}
      </div>
      <DialogActions>
        <Button onClick={onClose} disabled={pending} data-autofocus>
          Cancel
        </Button>
        <Button variant="danger" onClick={onConfirm} pending={pending}>
          {confirmLabel}
        </Button>
      </DialogActions>
    </Dialog>
  );
}
