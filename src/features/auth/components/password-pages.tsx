import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { emailAddress, newPassword } from '@shared/schemas/account';
import { useRequestPasswordReset, useResetPassword } from '../api/account';
import { AuthFrame, bannerText, DevMailboxLink, ErrorBanner, fieldErrors, NewPasswordField, Notice, TextField, type FieldErrors } from '@/components/form-bits';
import { pathTo } from '@/paths';

const backToSignIn = (
  <Link to={pathTo('signIn')} className="inline-flex min-h-touch items-center font-bold underline">
    Back to sign in
  </Link>
);

/** Ask for a reset link. The answer is the same whether or not the address has an account. */
export function ForgotPasswordPage() {
  const request = useRequestPasswordReset();
  const [error, setError] = useState<string | undefined>();
  const [sentTo, setSentTo] = useState<string | null>(null);

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = emailAddress.safeParse(new FormData(e.currentTarget).get('email'));
    if (!parsed.success) return setError('Enter a valid e-mail address.');
    setError(undefined);
    request.mutate(parsed.data, { onSuccess: () => setSentTo(parsed.data) });
  }

  if (sentTo) {
    return (
      <AuthFrame title="Check your e-mail" footer={backToSignIn}>
        <Notice>
          <p>
            If an account uses <strong>{sentTo}</strong>, we sent it a link to choose a new password. The link works once, for one hour.
          </p>
        </Notice>
        <DevMailboxLink href={request.data?.devMailbox} />
      </AuthFrame>
    );
  }
  return (
    <AuthFrame title="Forgot your password?" footer={backToSignIn}>
      <p>Enter the e-mail address of your account and we’ll send you a link to choose a new password.</p>
      <form onSubmit={submit} className="space-y-4" noValidate>
        <TextField label="E-mail" name="email" type="email" autoComplete="username" error={error} />
        <ErrorBanner>{request.error?.message}</ErrorBanner>
        <button type="submit" className="btn-primary w-full" disabled={request.isPending}>
          {request.isPending ? 'Sending…' : 'Send reset link'}
        </button>
      </form>
    </AuthFrame>
  );
}

/** The link from the reset e-mail: choose a new password (every device is signed out). */
export function ResetPasswordPage() {
  const { token = '' } = useParams();
  const reset = useResetPassword();
  const navigate = useNavigate();
  const [errors, setErrors] = useState<FieldErrors>({});

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const password = String(form.get('password') ?? '');
    const parsed = newPassword.safeParse(password);
    if (!parsed.success) return setErrors({ password: parsed.error.issues[0].message });
    if (password !== form.get('repeat')) return setErrors({ repeat: 'the two passwords differ' });
    setErrors({});
    reset.mutate(
      { token, password },
      {
        onSuccess: (r) => navigate(r.signedIn ? '/' : '/sign-in', { replace: true }),
        onError: (err) => setErrors(fieldErrors(err)),
      },
    );
  }

  return (
    <AuthFrame title="Choose a new password" footer={backToSignIn}>
      <p>Setting a new password signs you out on every device, and signs you in here.</p>
      <form onSubmit={submit} className="space-y-4" noValidate>
        <NewPasswordField label="New password" name="password" error={errors.password} />
        <TextField label="Repeat the new password" name="repeat" type="password" autoComplete="new-password" error={errors.repeat} />
        <ErrorBanner>{bannerText(reset.error, errors)}</ErrorBanner>
        {reset.error && !Object.keys(errors).length && (
          <p>
            <Link to={pathTo('forgotPassword')} className="font-bold underline">
              Ask for a new link
            </Link>
          </p>
        )}
        <button type="submit" className="btn-primary w-full" disabled={reset.isPending}>
          {reset.isPending ? 'Saving…' : 'Set new password'}
        </button>
      </form>
    </AuthFrame>
  );
}
