// Small pieces the account forms share: the page frame of the signed-out pages, a labelled
// input with its error, the error banner, and turning server/zod errors into per-field text.
import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { ZodError } from 'zod';
import { ApiError } from '@/lib/api-client';
import { pathTo } from '@/paths';
import { NEW_PASSWORD_MIN_LENGTH } from '@shared/schemas/account';

export type FieldErrors = Record<string, string>;

/** The first message for each field, from a zod error or the server's 400 ("body.email" → "email"). */
export function fieldErrors(err: unknown): FieldErrors {
  const out: FieldErrors = {};
  if (err instanceof ApiError) {
    for (const f of err.fields) {
      const name = f.field.replace(/^body\./, '');
      out[name] ??= f.message;
    }
  } else if (err && typeof err === 'object' && 'issues' in err) {
    for (const i of (err as ZodError).issues) out[String(i.path[0] ?? '')] ??= i.message;
  }
  return out;
}

export function AuthFrame({ title, children, footer }: { title: string; children: ReactNode; footer?: ReactNode }) {
  return (
    <div className="mx-auto max-w-md px-3 py-6">
      <p className="mb-2 text-xl font-bold tracking-tight text-slate">
        <Link to={pathTo('home')} className="inline-flex min-h-touch items-center">
          Twistlog
        </Link>
      </p>
      <h1 className="mb-4 text-3xl font-bold">{title}</h1>
      <div className="card space-y-4">{children}</div>
      {footer && <div className="mt-4 space-y-1">{footer}</div>}
    </div>
  );
}

export function TextField(props: {
  label: string;
  name: string;
  type?: string;
  autoComplete?: string;
  error?: string;
  hint?: string;
  defaultValue?: string;
  readOnly?: boolean;
}) {
  const id = `f-${props.name}`;
  const describedBy = [props.hint && `${id}-hint`, props.error && `${id}-error`].filter(Boolean).join(' ') || undefined;
  return (
    <div>
      <label htmlFor={id} className="field-label">
        {props.label}
      </label>
      <input
        id={id}
        name={props.name}
        type={props.type ?? 'text'}
        autoComplete={props.autoComplete}
        defaultValue={props.defaultValue}
        readOnly={props.readOnly}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={describedBy}
        className={`input ${props.readOnly ? 'bg-paper' : ''}`}
      />
      {props.hint && (
        <p id={`${id}-hint`} className="mt-1 text-sm text-slate">
          {props.hint}
        </p>
      )}
      {props.error && (
        <p id={`${id}-error`} className="mt-1 font-bold text-alert">
          {props.error}
        </p>
      )}
    </div>
  );
}

export function ErrorBanner({ children }: { children: ReactNode }) {
  if (!children) return null;
  return (
    <p role="alert" className="rounded-lg bg-alert-light p-3 text-alert">
      {children}
    </p>
  );
}

export function Notice({ children }: { children: ReactNode }) {
  return (
    <div role="status" className="rounded-lg bg-good-light p-3 text-good">
      {children}
    </div>
  );
}

/** The development mailbox is a server page, not a client route: a plain link. */
export function DevMailboxLink({ href }: { href?: string }) {
  if (!href) return null;
  return (
    <p>
      Running Twistlog on your own machine? Nothing is really sent:{' '}
      <a href={href} className="font-bold underline">
        open the development mailbox
      </a>
      .
    </p>
  );
}

/** A 400 whose message is meant for a person (not a field): the server's words. */
export const bannerText = (err: unknown, fields: FieldErrors) =>
  err instanceof ApiError && Object.keys(fields).length === 0 ? err.message : err instanceof ApiError ? null : err ? String(err) : null;

/** A field for choosing a password: masked, offered to password managers as a new one, with the length rule as its hint. */
export function NewPasswordField(props: { label: string; name: string; error?: string; advice?: string }) {
  const rule = `At least ${NEW_PASSWORD_MIN_LENGTH} characters`;
  return (
    <TextField
      label={props.label}
      name={props.name}
      type="password"
      autoComplete="new-password"
      hint={props.advice ? `${rule}; ${props.advice}` : `${rule}.`}
      error={props.error}
    />
  );
}
