import { useState } from 'react';
import { sendSheetInput } from '@shared/schemas/envelope';
import { useSendSheet } from '../api/send-sheet';

/** Sends the signed sheet (PDF attached) to a fabricator's address. */
export function SendSheetForm({ envelopeId }: { envelopeId: string }) {
  const [to, setTo] = useState('');
  const [note, setNote] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const send = useSendSheet(envelopeId);
  const submit = (e: React.FormEvent) => {
    e.preventDefault();
    const parsed = sendSheetInput.safeParse({ to, note: note || undefined });
    if (!parsed.success) return setProblem(`E-mail: "${to}" is not an e-mail address`);
    setProblem(null);
    send.mutate(parsed.data, { onSuccess: () => setNote('') });
  };
  return (
    <form className="card space-y-3" onSubmit={submit} aria-label="Send the fabrication sheet">
      <h3 className="text-lg font-bold">Send the sheet to a fabricator</h3>
      <label className="block">
        <span className="field-label">Fabricator's e-mail</span>
        <input className="input" type="email" autoComplete="email" value={to} onChange={(e) => setTo(e.target.value)} />
      </label>
      <label className="block">
        <span className="field-label">Note (optional)</span>
        <textarea className="input min-h-24 py-2" value={note} maxLength={2000} onChange={(e) => setNote(e.target.value)} />
      </label>
      {(problem || send.isError) && (
        <p role="alert" className="rounded-lg bg-alert-light p-2 text-alert">
          {problem ?? send.error?.message}
        </p>
      )}
      {send.isSuccess && (
        <p role="status" className="rounded-lg bg-good-light p-2 text-good">
          Sent to {send.data.toEmail}.
        </p>
      )}
      <button type="submit" className="btn-primary" disabled={send.isPending}>
        {send.isPending ? 'Sending…' : 'Send sheet'}
      </button>
    </form>
  );
}
