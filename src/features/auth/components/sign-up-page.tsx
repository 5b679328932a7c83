import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { signUpInput } from '@shared/schemas/account';
import { useConfirmSignUp, useSignUp } from '../api/account';
import { AuthFrame, bannerText, DevMailboxLink, ErrorBanner, fieldErrors, NewPasswordField, Notice, TextField, type FieldErrors } from '@/components/form-bits';
import { pathTo } from '@/paths';

/** Create a workshop and become its first admin: confirmed by the link in an e-mail. */
export function SignUpPage() {
  const signUp = useSignUp();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [sentTo, setSentTo] = useState<string | null>(null);

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const parsed = signUpInput.safeParse(Object.fromEntries(form));
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    signUp.mutate(parsed.data, {
      onSuccess: () => setSentTo(parsed.data.email),
      onError: (err) => setErrors(fieldErrors(err)),
    });
  }

  if (sentTo) {
    return (
      <AuthFrame title="Check your e-mail">
        <Notice>
          <p>
            We sent a message to <strong>{sentTo}</strong>. Open the link in it to create your workshop; it works for 24 hours.
          </p>
        </Notice>
        <p>No e-mail after a few minutes? Look in the spam folder, or sign up again.</p>
        <DevMailboxLink href={signUp.data?.devMailbox} />
      </AuthFrame>
    );
  }

  return (
    <AuthFrame
      title="Create your workshop"
      footer={
        <Link to={pathTo('signIn')} className="inline-flex min-h-touch items-center font-bold underline">
          Have an account? Sign in
        </Link>
      }
    >
      <p>You become the workshop’s admin and can then invite your engineers, testers and viewers.</p>
      <form onSubmit={submit} className="space-y-4" noValidate>
        <TextField label="Workshop name" name="teamName" autoComplete="organization" error={errors.teamName} />
        <TextField label="Your name" name="name" autoComplete="name" error={errors.name} />
        <TextField label="E-mail" name="email" type="email" autoComplete="email" error={errors.email} />
        <NewPasswordField label="Password" name="password" advice="a few words make a good one." error={errors.password} />
        <ErrorBanner>{bannerText(signUp.error, errors)}</ErrorBanner>
        <button type="submit" className="btn-primary w-full" disabled={signUp.isPending}>
          {signUp.isPending ? 'Sending…' : 'Create workshop'}
        </button>
      </form>
    </AuthFrame>
  );
}

/** The link from the sign-up e-mail: one button creates the workshop (a link checker's visit does nothing). */
export function ConfirmSignUpPage() {
  const { token = '' } = useParams();
  const confirm = useConfirmSignUp();
  const navigate = useNavigate();
  return (
    <AuthFrame
      title="Create your workshop"
      footer={
        <Link to={pathTo('signIn')} className="inline-flex min-h-touch items-center font-bold underline">
          Sign in instead
        </Link>
      }
    >
      <p>Your e-mail address is confirmed by this link. Create the workshop now, with you as its admin.</p>
      <ErrorBanner>{confirm.error?.message}</ErrorBanner>
      {confirm.isError && (
        <p>
          <Link to={pathTo('signUp')} className="font-bold underline">
            Sign up again
          </Link>{' '}
          for a new link.
        </p>
      )}
      <button
        type="button"
        className="btn-primary w-full"
        disabled={confirm.isPending || confirm.isSuccess}
        onClick={() => confirm.mutate(token, { onSuccess: () => navigate(pathTo('home'), { replace: true }) })}
      >
        {confirm.isPending ? 'Creating…' : 'Create my workshop'}
      </button>
    </AuthFrame>
  );
}
