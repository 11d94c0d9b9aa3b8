import { useState, type FormEvent } from 'react';
import { changeEmailSchema, changePasswordSchema, updateAccountSchema } from '@shared/schemas/auth';
import type { FieldErrors } from '@shared/schemas/errors';
import { Button } from '@/components/Button';
import { CheckboxField, SelectField, TextField } from '@/components/Field';
import { KeyIcon, MailIcon, MonitorIcon, UserIcon } from '@/components/icons';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { ErrorState, LoadingRegion, Skeleton } from '@/components/States';
import { errorMessage, isApiError } from '@/lib/api';
import { formatDate, formatDateTime } from '@/lib/format';
import { parseForm, serverFormErrors } from '@/lib/forms';
import { useSignedInMe } from '../auth/hooks';
import { useChangeEmail, useChangePassword, useRevokeSession, useSessions, useUpdateAccount, useUpdatePreferences } from './hooks';
import { UNIT_SYSTEM_LABELS } from './units';

export function AccountPage() {
  const me = useSignedInMe();
  return (
    <div className="max-w-3xl">
      <PageHeader title="Account" description={<span>Signed in as <span className="font-mono">{me.user.email}</span> · member since {formatDate(me.user.createdAt)}</span>} />
      <div className="space-y-6">
        <Card icon={<UserIcon size={16} />} title="Profile">
          <ProfileForm name={me.user.name} />
        </Card>
        <Card icon={<MailIcon size={16} />} title="Change e-mail">
          <EmailForm email={me.user.email} />
        </Card>
        <Card icon={<KeyIcon size={16} />} title="Change password">
          <PasswordForm />
        </Card>
        <Card icon={<RulerIcon />} title="Units">
          <UnitsForm />
        </Card>
        <Card icon={<MonitorIcon size={16} />} title="Sessions">
          <SessionList />
        </Card>
      </div>
    </div>
  );
}

function Card({ icon, title, children }: { icon: React.ReactNode; title: string; children: React.ReactNode }) {
  return (
    <section aria-label={title} className="rounded-lg border border-graphite-200 bg-white shadow-xs">
      <h2 className="flex items-center gap-2 border-b border-graphite-100 px-5 py-3 text-sm font-semibold">
        <span className="text-copper-600">{icon}</span>
        {title}
      </h2>
      <div className="px-5 py-4">{children}</div>
    </section>
  );
}

function ProfileForm({ name }: { name: string }) {
  const update = useUpdateAccount();
  const [value, setValue] = useState(name);
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const server = serverFormErrors(update.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = parseForm(updateAccountSchema, { name: value });
    if (!parsed.ok) return setClientErrors(parsed.fieldErrors);
    setClientErrors({});
    update.mutate({ name: parsed.data.name ?? value });
  }

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-wrap items-start gap-3" aria-label="Profile">
      <div className="min-w-60 flex-1">
        <TextField label="Name" name="name" autoComplete="name" value={value} onChange={(e) => { setValue(e.target.value); update.reset(); }} errors={fieldErrors.name} />
      </div>
      <Button type="submit" variant="primary" className="mt-6" pending={update.isPending} disabled={value.trim() === name}>
        Save name
      </Button>
      <div aria-live="polite" className="w-full empty:hidden">
        {server.formError ? <Notice signal="error">{server.formError}</Notice> : null}
        {update.isSuccess ? <Notice signal="success">Name saved.</Notice> : null}
      </div>
    </form>
  );
}

function EmailForm({ email }: { email: string }) {
  const change = useChangeEmail();
  const [values, setValues] = useState({ email: '', currentPassword: '' });
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const server = serverFormErrors(change.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };
  let formError = server.formError;
  if (isApiError(change.error) && change.error.code === 'invalid_credentials') {
    fieldErrors.currentPassword ??= ['Current password is incorrect.'];
    formError = null;
  }

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = parseForm(changeEmailSchema, values);
    if (!parsed.ok) return setClientErrors(parsed.fieldErrors);
    setClientErrors({});
    change.mutate(parsed.data, { onSuccess: () => setValues({ email: '', currentPassword: '' }) });
  }

  return (
    <form noValidate onSubmit={onSubmit} className="max-w-sm space-y-4" aria-label="Change e-mail">
      <div aria-live="polite" className="empty:hidden">
        {formError ? <Notice signal="error">{formError}</Notice> : null}
        {change.isSuccess ? <Notice signal="success">E-mail changed to {email}. Sign in with it from now on.</Notice> : null}
      </div>
      <TextField
        label="New e-mail"
        name="email"
        type="email"
        autoComplete="email"
        value={values.email}
        onChange={(e) => { setValues((v) => ({ ...v, email: e.target.value })); change.reset(); }}
        errors={fieldErrors.email}
      />
      <TextField
        label="Current password"
        name="currentPassword"
        type="password"
        autoComplete="current-password"
        hint="Changing the e-mail you sign in with asks for your password."
        value={values.currentPassword}
        onChange={(e) => setValues((v) => ({ ...v, currentPassword: e.target.value }))}
        errors={fieldErrors.currentPassword}
      />
      <Button type="submit" variant="primary" pending={change.isPending}>
        Change e-mail
      </Button>
    </form>
  );
}

const emptyPassword = { currentPassword: '', newPassword: '', endOtherSessions: true };

function PasswordForm() {
  const change = useChangePassword();
  const [values, setValues] = useState(emptyPassword);
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  const server = serverFormErrors(change.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };
  let formError = server.formError;
  // A wrong current password is that field's error, not the form's.
  if (isApiError(change.error) && change.error.code === 'invalid_credentials') {
    fieldErrors.currentPassword ??= ['Current password is incorrect.'];
    formError = null;
  }

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = parseForm(changePasswordSchema, values);
    if (!parsed.ok) return setClientErrors(parsed.fieldErrors);
    setClientErrors({});
    change.mutate(parsed.data, { onSuccess: () => setValues(emptyPassword) });
  }

  return (
    <form noValidate onSubmit={onSubmit} className="max-w-sm space-y-4" aria-label="Change password">
      <div aria-live="polite" className="empty:hidden">
        {formError ? <Notice signal="error">{formError}</Notice> : null}
        {change.isSuccess ? <Notice signal="success">Password changed.</Notice> : null}
      </div>
      <TextField
        label="Current password"
        name="currentPassword"
        type="password"
        autoComplete="current-password"
        value={values.currentPassword}
        onChange={(e) => setValues((v) => ({ ...v, currentPassword: e.target.value }))}
        errors={fieldErrors.currentPassword}
      />
      <TextField
        label="New password"
        name="newPassword"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters."
        value={values.newPassword}
        onChange={(e) => setValues((v) => ({ ...v, newPassword: e.target.value }))}
        errors={fieldErrors.newPassword}
      />
      <CheckboxField
        label="Sign out my other sessions"
        checked={values.endOtherSessions}
        onChange={(e) => setValues((v) => ({ ...v, endOtherSessions: e.target.checked }))}
      />
      <Button type="submit" variant="primary" pending={change.isPending}>
        Change password
      </Button>
    </form>
  );
}

/** A readable guess at the browser from its user-agent string; the raw string stays in the tooltip. */
function describeAgent(ua: string | null): string {
  if (!ua) return 'Unknown browser';
  const browser = /Edg\//.test(ua) ? 'Edge' : /Firefox\//.test(ua) ? 'Firefox' : /Chrom(e|ium)\//.test(ua) ? 'Chromium-based browser' : /Safari\//.test(ua) ? 'Safari' : 'Browser';
  const os = /Windows/.test(ua) ? 'Windows' : /Android/.test(ua) ? 'Android' : /iPhone|iPad/.test(ua) ? 'iOS' : /Mac OS X/.test(ua) ? 'macOS' : /Linux/.test(ua) ? 'Linux' : '';
  return os ? `${browser} on ${os}` : browser;
}

function SessionList() {
  const sessions = useSessions();
  const revoke = useRevokeSession();
  if (sessions.isPending) {
    return (
      <LoadingRegion label="Loading sessions">
        <div className="space-y-3">
          <Skeleton className="h-4 w-2/3" />
          <Skeleton className="h-4 w-1/2" />
        </div>
      </LoadingRegion>
    );
  }
  if (sessions.isError) {
    return <ErrorState title="Could not load sessions" error={sessions.error} onRetry={() => sessions.refetch()} retrying={sessions.isFetching} />;
  }
  return (
    <>
      {revoke.error ? (
        <Notice signal="error" className="mb-3">
          {errorMessage(revoke.error)}
        </Notice>
      ) : null}
      <ul className="-my-2 divide-y divide-graphite-100">
        {sessions.data.map((s) => (
          <li key={s.id} className="flex flex-wrap items-center gap-3 py-2.5 text-[13px]">
            <MonitorIcon size={16} className="text-graphite-400" />
            <span className="min-w-0 flex-1">
              <span className="block font-medium" title={s.userAgent ?? undefined}>
                {describeAgent(s.userAgent)}
                {s.current ? (
                  <span className="ml-2 rounded border border-ok-200 bg-ok-50 px-1.5 py-px text-[11px] font-semibold text-ok-700">This session</span>
                ) : null}
              </span>
              <span className="block text-xs text-graphite-500">
                Signed in {formatDateTime(s.createdAt)} · expires {formatDateTime(s.expiresAt)}
              </span>
            </span>
            {!s.current ? (
              <Button size="sm" onClick={() => revoke.mutate(s.id)} disabled={revoke.isPending} aria-label={`Sign out session from ${formatDateTime(s.createdAt)}`}>
                Sign out
              </Button>
            ) : null}
          </li>
        ))}
      </ul>
    </>
  );
}

function RulerIcon() {
  return (
    <svg width={16} height={16} viewBox="0 0 16 16" fill="none" stroke="currentColor" strokeWidth={1.5} strokeLinecap="round" aria-hidden="true" focusable="false">
      <path d="m2 11 9-9 3 3-9 9z" />
      <path d="m5 8 1.5 1.5M7 6l1 1M9 4l1.5 1.5" />
    </svg>
  );
}

/** The user's own unit system for their screens, or follow each team's setting. */
function UnitsForm() {
  const me = useSignedInMe();
  const update = useUpdatePreferences();
  const saved = me.preferences?.unitSystem ?? null;
  const [choice, setChoice] = useState<'team' | 'metric' | 'us'>(saved ?? 'team');
  const current = saved ?? 'team';
  return (
    <form
      className="max-w-md space-y-3"
      onSubmit={(e: FormEvent) => {
        e.preventDefault();
        update.mutate({ unitSystem: choice === 'team' ? null : choice });
      }}
    >
      <SelectField
        label="Units on your screens"
        name="unitSystem"
        value={choice}
        onChange={(e) => setChoice(e.target.value as 'team' | 'metric' | 'us')}
        hint="Canvas labels, properties, findings, bills of materials and exports. Only your own screens change; the team's setting stays."
      >
        <option value="team">Follow each team’s setting</option>
        <option value="metric">{UNIT_SYSTEM_LABELS.metric}</option>
        <option value="us">{UNIT_SYSTEM_LABELS.us}</option>
      </SelectField>
      {update.isError ? <Notice signal="error">{errorMessage(update.error)}</Notice> : null}
      {update.isSuccess && choice === current ? (
        <p role="status" className="text-xs text-graphite-600">
          Saved.
        </p>
      ) : null}
      <Button type="submit" size="sm" pending={update.isPending} disabled={choice === current}>
        Save units
      </Button>
    </form>
  );
}
