import { useState, type FormEvent } from 'react';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { newPassword, personName } from '@shared/schemas/account';
import { useAcceptInvitation, useInvitationPreview } from '../api/account';
import { AuthFrame, bannerText, ErrorBanner, fieldErrors, NewPasswordField, TextField, type FieldErrors } from '@/components/form-bits';
import { roleTable } from '@shared/permissions';
import { pathTo } from '@/paths';

/** /invite/:token — join a workshop: a new person chooses a name and password. */
export function AcceptInvitationPage() {
  const { token = '' } = useParams();
  const preview = useInvitationPreview(token);
  const accept = useAcceptInvitation();
  const navigate = useNavigate();
  const [errors, setErrors] = useState<FieldErrors>({});

  if (preview.isPending) {
    return (
      <AuthFrame title="Join a workshop">
        <p role="status">Checking the invitation…</p>
      </AuthFrame>
    );
  }
  if (preview.isError) {
    return (
      <AuthFrame
        title="Join a workshop"
        footer={
          <Link to={pathTo('signIn')} className="inline-flex min-h-touch items-center font-bold underline">
            Go to sign in
          </Link>
        }
      >
        <ErrorBanner>{preview.error.message}</ErrorBanner>
        <p>Ask the workshop’s admin to invite you again.</p>
      </AuthFrame>
    );
  }
  const inv = preview.data;

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const password = String(form.get('password') ?? '');
    const next: FieldErrors = {};
    let name: string | undefined;
    if (!inv.hasAccount) {
      const n = personName.safeParse(form.get('name') ?? '');
      if (n.success) name = n.data;
      else next.name = n.error.issues[0].message;
      const p = newPassword.safeParse(password);
      if (!p.success) next.password = p.error.issues[0].message;
    } else if (!password) next.password = 'enter the password of your account';
    setErrors(next);
    if (Object.keys(next).length) return;
    accept.mutate({ token, name, password }, { onSuccess: () => navigate(pathTo('home'), { replace: true }), onError: (err) => setErrors(fieldErrors(err)) });
  }

  return (
    <AuthFrame title={`Join ${inv.teamName}`}>
      <p>
        {inv.invitedByName ? `${inv.invitedByName} invited you` : 'You are invited'} to join <strong>{inv.teamName}</strong> on Twistlog as{' '}
        <strong>{inv.role}</strong>: {roleTable[inv.role].summary}
      </p>
      <form onSubmit={submit} className="space-y-4" noValidate>
        <TextField label="E-mail" name="email" type="email" defaultValue={inv.email} readOnly autoComplete="username" />
        {inv.hasAccount ? (
          <>
            <p>You have a Twistlog account already: confirm with its password.</p>
            <TextField label="Your password" name="password" type="password" autoComplete="current-password" error={errors.password} />
          </>
        ) : (
          <>
            <TextField label="Your name" name="name" autoComplete="name" error={errors.name} />
            <NewPasswordField label="Choose a password" name="password" error={errors.password} />
          </>
        )}
        <ErrorBanner>{bannerText(accept.error, errors)}</ErrorBanner>
        <button type="submit" className="btn-primary w-full" disabled={accept.isPending}>
          {accept.isPending ? 'Joining…' : 'Join workshop'}
        </button>
      </form>
    </AuthFrame>
  );
}
