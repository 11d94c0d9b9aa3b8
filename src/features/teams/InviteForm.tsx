import { useState, type FormEvent } from 'react';
import { ROLES, ROLE_DESCRIPTIONS, ROLE_LABELS, type Role } from '@shared/roles';
import { inviteSchema } from '@shared/schemas/teams';
import type { FieldErrors } from '@shared/schemas/errors';
import { Button } from '@/components/Button';
import { SelectField, TextField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { parseForm, serverFormErrors } from '@/lib/forms';
import { useSendInvite } from './hooks';

export function InviteForm({ teamId }: { teamId: string }) {
  const send = useSendInvite(teamId);
  const [values, setValues] = useState<{ email: string; role: Role }>({ email: '', role: 'designer' });
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const [sentTo, setSentTo] = useState<string | null>(null);
  const server = serverFormErrors(send.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    setSentTo(null);
    const parsed = parseForm(inviteSchema, values);
    if (!parsed.ok) return setClientErrors(parsed.fieldErrors);
    setClientErrors({});
    send.mutate(parsed.data, {
      onSuccess: (invite) => {
        setSentTo(invite.email);
        setValues((v) => ({ ...v, email: '' }));
      },
    });
  }

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-3" aria-label="Invite member">
      <div aria-live="polite">
        {server.formError ? <Notice signal="error">{server.formError}</Notice> : null}
        {sentTo ? <Notice signal="success">Invite sent to {sentTo}.</Notice> : null}
      </div>
      <TextField
        label="E-mail"
        name="email"
        type="email"
        autoComplete="off"
        value={values.email}
        onChange={(e) => setValues((v) => ({ ...v, email: e.target.value }))}
        errors={fieldErrors.email}
      />
      <SelectField
        label="Role"
        name="role"
        value={values.role}
        hint={ROLE_DESCRIPTIONS[values.role]}
        onChange={(e) => setValues((v) => ({ ...v, role: e.target.value as Role }))}
        errors={fieldErrors.role}
      >
        {ROLES.map((r) => (
          <option key={r} value={r}>
            {ROLE_LABELS[r]}
          </option>
        ))}
      </SelectField>
      <Button type="submit" variant="primary" className="w-full" pending={send.isPending}>
        Send invite
      </Button>
    </form>
  );
}
