/** The message for a new revision, and the save. */
import { useState } from 'react';
import { Button } from '@/components/Button';
import { Dialog, DialogActions } from '@/components/Dialog';
import { TextAreaField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { errorMessage } from '@/lib/api';

export function SaveRevisionDialog({
  open, onClose, nextNumber, pending, error, onSave,
}: {
  open: boolean;
  onClose: () => void;
  nextNumber: number;
  pending: boolean;
  error: unknown;
  onSave: (message: string) => void;
}) {
  // The message belongs to the revision it was written for: once that revision is saved, the next starts empty.
  const [draft, setDraft] = useState({ forNumber: nextNumber, message: '' });
  const message = draft.forNumber === nextNumber ? draft.message : '';
  const setMessage = (m: string) => setDraft({ forNumber: nextNumber, message: m });
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={`Save revision ${nextNumber}`}
      description="A revision is a snapshot that never changes: its content, your name, the time, this message and the results computed for it."
    >
      <form
        onSubmit={(e) => {
          e.preventDefault();
          onSave(message.trim());
        }}
      >
        <TextAreaField
          label="What changed"
          hint="For example: take-off moved to the diagonal batteries."
          value={message}
          maxLength={500}
          onChange={(e) => setMessage(e.target.value)}
          data-autofocus
        />
        {error ? <Notice signal="error" className="mt-3">{errorMessage(error)}</Notice> : null}
        <DialogActions>
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" pending={pending}>
            Save revision {nextNumber}
          </Button>
        </DialogActions>
      </form>
    </Dialog>
  );
}
