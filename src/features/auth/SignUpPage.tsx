import { useState, type FormEvent } from 'react';
import { Link, Navigate, useNavigate, useSearchParams } from 'react-router';
import { signUpSchema } from '@shared/schemas/auth';
import type { FieldErrors } from '@shared/schemas/errors';
import { Button } from '@/components/Button';
import { TextField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageLoading } from '@/components/States';
import { parseForm, serverFormErrors } from '@/lib/forms';
import { AuthLayout, safeNext } from './AuthLayout';
import { authKeys, useMe, useSignUp } from './hooks';
import { useQueryClient } from '@tanstack/react-query';

export function SignUpPage() {
  const me = useMe();
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));
  const navigate = useNavigate();
  const signUp = useSignUp();
  const [values, setValues] = useState({ name: '', email: '', password: '' });
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});
  // The server answers alike whether or not the address already has an account (it e-mails the address
  // either way); when no session came of it, the address was already registered.
  const [checkMail, setCheckMail] = useState<string | null>(null);
  const queryClient = useQueryClient();

  if (me.isPending) return <PageLoading />;
  if (me.data && !signUp.isPending && !checkMail) return <Navigate to={next} replace />;

  const server = serverFormErrors(signUp.error);
  const fieldErrors: FieldErrors = { ...server.fieldErrors, ...clientErrors };
  const formError = server.formError;

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = parseForm(signUpSchema, values);
    if (!parsed.ok) {
      setClientErrors(parsed.fieldErrors);
      signUp.reset();
      return;
    }
    setClientErrors({});
    setCheckMail(null);
    signUp.mutate(parsed.data, {
      onSuccess: () => {
        if (queryClient.getQueryData(authKeys.me)) navigate(next, { replace: true });
        else setCheckMail(parsed.data.email);
      },
    });
  }

  const set = (key: keyof typeof values) => (e: React.ChangeEvent<HTMLInputElement>) => setValues((v) => ({ ...v, [key]: e.target.value }));

  return (
    <AuthLayout
      title="Create your account"
      subtitle="You can create a team or accept an invite next."
      footer={
        <>
          Already have an account?{' '}
          <Link to={`/sign-in${params.get('next') ? `?next=${encodeURIComponent(next)}` : ''}`} className="font-medium text-copper-300 underline-offset-2 hover:underline">
            Sign in
          </Link>
        </>
      }
    >
      <form noValidate onSubmit={onSubmit} className="space-y-4" aria-label="Create account">
        <div aria-live="assertive">
          {formError ? <Notice signal="error">{formError}</Notice> : null}
          {checkMail ? (
            <Notice signal="note">
              We have sent a message to {checkMail}. If this address already has an account, sign in with it instead.
            </Notice>
          ) : null}
        </div>
        <TextField label="Name" name="name" autoComplete="name" value={values.name} onChange={set('name')} errors={fieldErrors.name} data-autofocus />
        <TextField label="E-mail" name="email" type="email" autoComplete="email" value={values.email} onChange={set('email')} errors={fieldErrors.email} />
        <TextField
          label="Password"
          name="password"
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters. A passphrase of a few unrelated words works well."
          value={values.password}
          onChange={set('password')}
          errors={fieldErrors.password}
        />
        <Button type="submit" variant="primary" className="w-full" pending={signUp.isPending}>
          Create account
        </Button>
      </form>
    </AuthLayout>
  );
}
