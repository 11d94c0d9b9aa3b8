import { useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router';
import { createTeamSchema } from '@shared/schemas/teams';
import type { FieldErrors } from '@shared/schemas/errors';
import { Button } from '@/components/Button';
import { SelectField, TextField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { parseForm, serverFormErrors } from '@/lib/forms';
import { useCreateTeam } from './hooks';

export function CreateTeamForm({ onCancel, onCreated }: { onCancel?: () => void; onCreated?: () => void }) {
  const navigate = useNavigate();
  const create = useCreateTeam();
  const [values, setValues] = useState({ name: '', unitSystem: 'metric' });
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const server = serverFormErrors(create.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = parseForm(createTeamSchema, values);
    if (!parsed.ok) return setClientErrors(parsed.fieldErrors);
    setClientErrors({});
    create.mutate(parsed.data, {
      onSuccess: (team) => {
        onCreated?.();
        navigate(`/teams/${team.id}/projects`);
      },
    });
  }

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4" aria-label="Create team">
      <div aria-live="assertive">{server.formError ? <Notice signal="error">{server.formError}</Notice> : null}</div>
      <TextField
        label="Team name"
        name="name"
        placeholder="e.g. Harbour Road Electrical"
        value={values.name}
        onChange={(e) => setValues((v) => ({ ...v, name: e.target.value }))}
        errors={fieldErrors.name}
        data-autofocus
      />
      <SelectField
        label="Units"
        name="unitSystem"
        hint="How lengths and conductor sizes are shown. Either can be typed in."
        value={values.unitSystem}
        onChange={(e) => setValues((v) => ({ ...v, unitSystem: e.target.value }))}
        errors={fieldErrors.unitSystem}
      >
        <option value="metric">Metric (m, mm²)</option>
        <option value="us">US customary (ft, AWG/kcmil)</option>
      </SelectField>
      <div className="flex justify-end gap-2 pt-1">
        {onCancel ? (
          <Button onClick={onCancel} disabled={create.isPending}>
            Cancel
          </Button>
        ) : null}
        <Button type="submit" variant="primary" pending={create.isPending}>
          Create team
        </Button>
      </div>
    </form>
  );
}
