import { useState, type FormEvent } from 'react';
import { Link, Navigate, useNavigate, useSearchParams } from 'react-router';
import { signInSchema } from '@shared/schemas/auth';
import type { FieldErrors } from '@shared/schemas/errors';
import { Button } from '@/components/Button';
import { TextField } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageLoading } from '@/components/States';
import { parseForm, serverFormErrors } from '@/lib/forms';
import { AuthLayout, safeNext } from './AuthLayout';
import { useMe, useSignIn } from './hooks';

export function SignInPage() {
  const me = useMe();
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));
  const navigate = useNavigate();
  const signIn = useSignIn();
  const [values, setValues] = useState({ email: '', password: '' });
  const [clientErrors, setClientErrors] = useState<FieldErrors>({});

  if (me.isPending) return <PageLoading />;
  if (me.data && !signIn.isPending) return <Navigate to={next} replace />;

  const server = serverFormErrors(signIn.error);
  const fieldErrors = { ...server.fieldErrors, ...clientErrors };

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = parseForm(signInSchema, values);
    if (!parsed.ok) {
      setClientErrors(parsed.fieldErrors);
      signIn.reset();
      return;
    }
    setClientErrors({});
    signIn.mutate(parsed.data, { onSuccess: () => navigate(next, { replace: true }) });
  }

  return (
    <AuthLayout
      title="Sign in"
      subtitle="Battery bank design, checks and review for your crew."
      footer={
        <>
          New here?{' '}
          <Link to={`/sign-up${params.get('next') ? `?next=${encodeURIComponent(next)}` : ''}`} className="font-medium text-copper-300 underline-offset-2 hover:underline">
            Create an account
          </Link>
        </>
      }
    >
      <form noValidate onSubmit={onSubmit} className="space-y-4" aria-label="Sign in">
        <div aria-live="assertive">{server.formError ? <Notice signal="error">{server.formError}</Notice> : null}</div>
        <TextField
          label="E-mail"
          name="email"
          type="email"
          autoComplete="email"
          value={values.email}
          onChange={(e) => setValues((v) => ({ ...v, email: e.target.value }))}
          errors={fieldErrors.email}
          data-autofocus
        />
        <TextField
          label="Password"
          name="password"
          type="password"
          autoComplete="current-password"
          value={values.password}
          onChange={(e) => setValues((v) => ({ ...v, password: e.target.value }))}
          errors={fieldErrors.password}
        />
        <Button type="submit" variant="primary" className="w-full" pending={signIn.isPending}>
          Sign in
        </Button>
      </form>
    </AuthLayout>
  );
}
