import { useState, type FormEvent } from 'react';
import { useNavigate } from 'react-router-dom';
import type { UnitSystem } from '@shared/schemas';
import { changePasswordInput } from '@shared/schemas/account';
import { useMe } from '@/lib/auth/get-me';
import { useChangePassword, useSignOutEverywhere, useUpdateMe } from '../api/account';
import { bannerText, ErrorBanner, fieldErrors, NewPasswordField, Notice, TextField, type FieldErrors } from '@/components/form-bits';
import { pathTo } from '@/paths';

/** The signed-in person's own page: units, password, signing out of every device. */
export function AccountPage() {
  const me = useMe();
  if (!me.data) return null;
  const { user, team, role } = me.data;
  return (
    <div className="mx-auto max-w-xl space-y-6">
      <h1 className="text-2xl font-bold">Your account</h1>
      <section className="card space-y-1" aria-labelledby="you">
        <h2 id="you" className="text-lg font-bold">
          {user.name}
        </h2>
        <p>{user.email}</p>
        <p>
          <strong>{role}</strong> in {team.name}
        </p>
      </section>
      <UnitsSection current={user.unitSystem} teamDefault={team.unitSystem} />
      <ChangePasswordSection />
      <SignOutEverywhereSection />
    </div>
  );
}

function UnitsSection({ current, teamDefault }: { current: UnitSystem | null; teamDefault: UnitSystem }) {
  const update = useUpdateMe();
  // Show the choice in the same render as the tap (a controlled radio would otherwise spring back
  // until the mutation reports pending); the server's answer follows, and a failure undoes it.
  const [choice, setChoice] = useState<UnitSystem | null | undefined>(undefined);
  const shown = choice !== undefined ? choice : current;
  const options: { value: UnitSystem | null; label: string }[] = [
    { value: 'mm', label: 'Millimetres (mm)' },
    { value: 'in', label: 'Inches (in)' },
    { value: null, label: `Workshop default (${teamDefault})` },
  ];
  return (
    <section className="card" aria-labelledby="units">
      <fieldset>
        <legend id="units" className="mb-2 text-lg font-bold">
          Units on your screens
        </legend>
        <p className="mb-2 text-sm">Everything is stored in millimetres; this only changes what you see and type.</p>
        <div className="space-y-2">
          {options.map((o) => (
            <label key={String(o.value)} className="flex min-h-touch cursor-pointer items-center gap-3 rounded-lg border-2 border-rule px-3">
              <input
                type="radio"
                name="unitSystem"
                className="h-6 w-6"
                checked={shown === o.value}
                disabled={update.isPending}
                onChange={() => {
                  setChoice(o.value);
                  update.mutate({ unitSystem: o.value }, { onError: () => setChoice(undefined) });
                }}
              />
              <span className="font-bold">{o.label}</span>
            </label>
          ))}
        </div>
        <ErrorBanner>{update.error?.message}</ErrorBanner>
      </fieldset>
    </section>
  );
}

function ChangePasswordSection() {
  const change = useChangePassword();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [done, setDone] = useState(false);

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const formEl = e.currentTarget;
    const parsed = changePasswordInput.safeParse(Object.fromEntries(new FormData(formEl)));
    setDone(false);
    if (!parsed.success) return setErrors(fieldErrors(parsed.error));
    setErrors({});
    change.mutate(parsed.data, {
      onSuccess: () => {
        formEl.reset();
        setDone(true);
      },
      onError: (err) => setErrors(fieldErrors(err)),
    });
  }

  return (
    <section className="card space-y-3" aria-labelledby="password">
      <h2 id="password" className="text-lg font-bold">
        Change password
      </h2>
      <p className="text-sm">Every other device you use is signed out; this one stays signed in.</p>
      <form onSubmit={submit} className="space-y-4" noValidate>
        <TextField label="Current password" name="currentPassword" type="password" autoComplete="current-password" error={errors.currentPassword} />
        <NewPasswordField label="New password" name="newPassword" error={errors.newPassword} />
        <ErrorBanner>{bannerText(change.error, errors)}</ErrorBanner>
        {done && <Notice>Password changed.</Notice>}
        <button type="submit" className="btn-primary w-full" disabled={change.isPending}>
          {change.isPending ? 'Saving…' : 'Change password'}
        </button>
      </form>
    </section>
  );
}

function SignOutEverywhereSection() {
  const signOutAll = useSignOutEverywhere();
  const navigate = useNavigate();
  return (
    <section className="card space-y-3" aria-labelledby="devices">
      <h2 id="devices" className="text-lg font-bold">
        Devices
      </h2>
      <p className="text-sm">Lost a phone, or signed in on a shared computer? Sign out everywhere, this device too.</p>
      <ErrorBanner>{signOutAll.error?.message}</ErrorBanner>
      <button
        type="button"
        className="btn w-full border-alert text-alert"
        disabled={signOutAll.isPending}
        onClick={() => signOutAll.mutate(undefined, { onSuccess: () => navigate(pathTo('signIn'), { replace: true }) })}
      >
        Sign out of all devices
      </button>
    </section>
  );
}
