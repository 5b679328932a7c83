/** The standing notice: the envelope is a planning aid; codes and qualified people decide. */
export function SafetyNotice({ compact = false }: { compact?: boolean }) {
  return (
    <aside role="note" className={`rounded-lg border-2 border-signal-dark bg-signal/15 ${compact ? 'p-2 text-sm' : 'p-4'}`}>
      <strong>Planning aid only.</strong> Twistlog's envelopes help plan a boot or seal; they are not a structural or road-legality approval. Local codes and
      qualified professionals decide. Flex testing can roll or drop a vehicle: keep a spotter in sight and nobody beside or under it while it moves.
    </aside>
  );
}
