import type { ItemResult } from '@/lib/db/records';

/** What could not be saved on this phone, record by record. */
export function SaveProblems({ results }: { results: ItemResult[] }) {
  const bad = results.filter((r): r is Extract<ItemResult, { ok: false }> => !r.ok);
  if (!bad.length) return null;
  return (
    <div role="alert" className="rounded-lg bg-alert-light p-3 font-bold text-alert">
      Not saved:
      <ul className="list-disc pl-5">
        {bad.map((b) => (
          <li key={b.id}>{b.message}</li>
        ))}
      </ul>
    </div>
  );
}
