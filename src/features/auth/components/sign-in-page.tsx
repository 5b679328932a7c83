import { useState, type FormEvent } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { useQueryClient } from '@tanstack/react-query';
import { signInInput, useSignIn } from '../api/sign-in';
import { pathTo } from '@/paths';
import { meQuery } from '@/lib/auth/get-me';
import { startPath } from '@/lib/auth/start-page';

export function SignInPage() {
  const signIn = useSignIn();
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const [error, setError] = useState<string | null>(null);

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const parsed = signInInput.safeParse({ email: form.get('email'), password: form.get('password') });
    if (!parsed.success) {
      setError('Enter your e-mail address and password.');
      return;
    }
    setError(null);
    // Straight to the person's start page: by way of the home address, its redirect could land
    // after a tap on a menu link and undo it. Who is signed in is read first (the pages behind
    // sign-in read it anyway); without an answer, the home address sorts it out.
    signIn.mutate(parsed.data, {
      onSuccess: async () => {
        const me = await queryClient.fetchQuery(meQuery()).catch(() => null);
        navigate(me ? startPath(me.role) : pathTo('home'));
      },
    });
  }

  return (
    <div className="mx-auto max-w-md px-3 py-8">
      <h1 className="mb-4 text-3xl font-bold">Sign in to Twistlog</h1>
      <form onSubmit={submit} className="card space-y-4" noValidate>
        <label className="block">
          <span className="field-label">E-mail</span>
          <input name="email" type="email" autoComplete="username" className="input" required />
        </label>
        <label className="block">
          <span className="field-label">Password</span>
          <input name="password" type="password" autoComplete="current-password" className="input" required />
        </label>
        {(error || signIn.isError) && (
          <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
            {error ?? signIn.error?.message}
          </p>
        )}
        <button type="submit" className="btn-primary w-full" disabled={signIn.isPending}>
          {signIn.isPending ? 'Signing in…' : 'Sign in'}
        </button>
      </form>
      <nav aria-label="Account" className="mt-4 flex flex-col gap-1">
        <Link to={pathTo('forgotPassword')} className="inline-flex min-h-touch items-center font-bold underline">
          Forgot your password?
        </Link>
        <Link to={pathTo('signUp')} className="inline-flex min-h-touch items-center font-bold underline">
          New workshop? Create an account
        </Link>
      </nav>
    </div>
  );
}
