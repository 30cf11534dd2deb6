import { useState, type FormEvent } from 'react';
import { Link, Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { LoginSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { TextField } from '@/components/field';
import { Logo } from '@/components/logo';
import { paths } from '@/config/paths';
import { ApiError } from '@/lib/api';
import { useResendConfirmation } from '@/lib/confirmation';
import { useMe } from '@/lib/me';
import { useSignIn } from '../api/sign-in';

/** Only same-site paths may follow sign-in. */
function safeNext(next: string | null): string {
  return next && next.startsWith('/') && !next.startsWith('//') ? next : paths.home;
}

export function SignInPage() {
  const me = useMe();
  const signIn = useSignIn();
  const resend = useResendConfirmation();
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});

  if (me.data) return <Navigate to={safeNext(params.get('next'))} replace />;

  const onSubmit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = LoginSchema.safeParse({ email, password });
    if (!parsed.success) {
      setFieldErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
      return;
    }
    setFieldErrors({});
    signIn.mutate(parsed.data, { onSuccess: () => navigate(safeNext(params.get('next')), { replace: true }) });
  };

  return (
    <div className="grid min-h-screen lg:grid-cols-[1.1fr_1fr]">
      <div className="relative hidden overflow-hidden bg-walnut-900 lg:block">
        <div className="absolute inset-0 bg-[radial-gradient(circle_at_30%_20%,rgba(217,147,47,0.35),transparent_55%),repeating-linear-gradient(100deg,rgba(255,255,255,0.025)_0px,rgba(255,255,255,0.025)_2px,transparent_2px,transparent_9px)]" />
        <div className="relative flex h-full flex-col justify-between p-12 text-parchment-100">
          <div className="flex items-center gap-3">
            <Logo className="h-10 w-10" />
            <span className="font-serif text-2xl font-semibold">Shellwright</span>
          </div>
          <div className="max-w-md">
            <p className="font-serif text-3xl leading-snug text-parchment-50">
              Measure the case, plan every coat and rest, and quote the work before the first rubber is charged.
            </p>
            <p className="mt-4 text-parchment-300">
              Estimates, quotes, the drying room and the price list of a French-polishing workshop, in one place.
            </p>
          </div>
          <p className="text-xs text-parchment-300">Spirit and shellac are flammable. Follow local fire codes and your workplace-safety regulator.</p>
        </div>
      </div>
      <div className="flex items-center justify-center bg-parchment-50 px-6 py-12">
        <form onSubmit={onSubmit} noValidate className="w-full max-w-sm space-y-5" aria-labelledby="signin-title">
          <div className="flex items-center gap-2 lg:hidden">
            <Logo />
            <span className="font-serif text-xl font-semibold">Shellwright</span>
          </div>
          <div>
            <h1 id="signin-title" className="text-3xl font-semibold text-walnut-900">
              Sign in
            </h1>
            <p className="mt-1 text-sm text-walnut-600">Use the account your workshop owner gave you, or the one you signed up with.</p>
          </div>
          {signIn.isError && signIn.error instanceof ApiError && signIn.error.code === 'email_unconfirmed' ? (
            <Alert tone="warning" title="Confirm your e-mail address first">
              {signIn.error.message}{' '}
              {resend.isSuccess ? (
                <span className="block pt-1">{resend.data.message}</span>
              ) : (
                <Button type="button" variant="secondary" size="sm" className="mt-2" busy={resend.isPending} onClick={() => resend.mutate({ email })}>
                  Send the link again
                </Button>
              )}
            </Alert>
          ) : (
            signIn.isError && (
              <Alert tone="error" title="Sign-in failed">
                {signIn.error.message}
              </Alert>
            )
          )}
          <TextField label="E-mail" type="email" name="email" autoComplete="username" value={email} onChange={(e) => setEmail(e.target.value)} error={fieldErrors.email} />
          <TextField
            label="Password"
            type="password"
            name="password"
            autoComplete="current-password"
            value={password}
            onChange={(e) => setPassword(e.target.value)}
            error={fieldErrors.password}
          />
          <Button type="submit" className="w-full" busy={signIn.isPending}>
            Sign in
          </Button>
          <p className="text-center text-sm">
            <Link to={paths.forgotPassword} className="text-walnut-700 underline decoration-walnut-300 underline-offset-2 hover:text-walnut-900">
              Forgot your password?
            </Link>
          </p>
          <p className="border-t border-parchment-200 pt-4 text-center text-sm text-walnut-600">
            A workshop new to Shellwright?{' '}
            <Link to={paths.signUp} className="font-medium text-walnut-800 underline decoration-walnut-300 underline-offset-2 hover:text-walnut-900">
              Sign up your workshop
            </Link>
          </p>
        </form>
      </div>
    </div>
  );
}
