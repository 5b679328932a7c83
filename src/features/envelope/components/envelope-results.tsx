import { ColumnHeads } from '@/components/column-heads';
import { sealReason, type BootSpanResult, type EnvelopeResult } from '@shared/flex';
import type { UnitSystem } from '@shared/schemas/common';
import type { AcknowledgedFlag, LegacyEnvelopeResult } from '@shared/schemas/envelope';
import { AXIS_NAMES, SIDE_NAMES, formatLengthValue, formatRatio, lengthWords } from '@shared/format';
import { envelopeRemarks, envelopeRows } from '@shared/envelope-rows';

const SIDES = ['top', 'bottom', 'left', 'right'] as const;

interface Props {
  result: EnvelopeResult | LegacyEnvelopeResult;
  boot: BootSpanResult | null;
  bootNote: string | null;
  unit: UnitSystem;
  /** Signed revisions: the flagged readings the engineer kept and acknowledged. */
  acknowledgedFlags?: AcknowledgedFlag[];
}

/** A list of remarks under a heading, or nothing when there are none. */
function Remarks({ title, items }: { title: string; items: string[] }) {
  if (items.length === 0) return null;
  return (
    <>
      <h4 className="mt-2 font-bold">{title}</h4>
      <ul className="list-disc pl-6 text-sm" aria-label={title}>
        {items.map((n) => (
          <li key={n}>{n}</li>
        ))}
      </ul>
    </>
  );
}

/**
 * The envelope per measure (the fore-aft gap's opening and closing apart) with the term and twist
 * direction that govern and why, the remarks on the readings and on the bound, the acknowledged
 * flags of a signed revision, then the boot spans and seal check per side.
 */
export function EnvelopeResults({ result, boot, bootNote, unit, acknowledgedFlags = [] }: Props) {
  const rows = envelopeRows(result, unit);
  const remarks = envelopeRemarks(result, unit);
  return (
    <div className="space-y-4">
      {/* Focusable so a keyboard can scroll a table wider than a phone. */}
      <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Design envelope, scrollable">
        <table className="min-w-full border-collapse bg-white text-right" aria-label="Design envelope">
          <caption className="p-2 text-left font-bold">Design envelope ({unit}): fore-aft + opens, − closes; lateral and vertical ± either way</caption>
          <ColumnHeads names={['Movement', 'Measured worst', 'Upper bound', 'Governs', 'Envelope']} left={['Movement', 'Governs']} />
          <tbody>
            {rows.map((r) => (
              <tr key={r.key} data-measure={r.key}>
                <th scope="row" className="border border-rule p-2 text-left">
                  {r.name}
                </th>
                <td className="border border-rule p-2 tabular-nums">{formatLengthValue(r.measuredWorstMm, unit)}</td>
                <td className="border border-rule p-2 tabular-nums">{r.upperBoundMm === null ? '—' : formatLengthValue(r.upperBoundMm, unit)}</td>
                <td className="border border-rule p-2 text-left">{r.governs}</td>
                <td className="border border-rule p-2 text-lg font-bold tabular-nums" data-testid={`envelope-${r.key}`}>
                  {r.sign}
                  {formatLengthValue(r.envelopeMm, unit)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div>
        <h4 className="font-bold">Why these values</h4>
        <ul className="list-disc pl-6 text-sm">
          {rows.map((r) => (
            <li key={r.key}>
              <b>{r.name}</b>: {r.reasons.join(' ')}
            </li>
          ))}
        </ul>
        <Remarks title="Remarks on the readings and the fit" items={remarks.readings} />
        <Remarks title="Remarks on the bound" items={remarks.bound} />
      </div>
      {acknowledgedFlags.length > 0 && (
        <div>
          <h4 className="font-bold">Flagged readings kept in the computation</h4>
          <ul className="list-disc pl-6 text-sm" aria-label="Acknowledged flagged readings">
            {acknowledgedFlags.map((f) => (
              <li key={f.readingId}>
                {f.poseLabel} · point {f.pointLabel} · {AXIS_NAMES[f.axis]}: entered {formatLengthValue(f.enteredMm, unit)} {unit},{' '}
                {formatLengthValue(f.residualMm, unit)} {unit} off the fit — acknowledged
                {f.note ? `: ${f.note}` : ''}
              </li>
            ))}
          </ul>
        </div>
      )}
      {boot === null ? (
        <p>{bootNote}</p>
      ) : (
        <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Boot spans, scrollable">
          <table className="min-w-full border-collapse bg-white text-right" aria-label="Boot spans">
            <caption className="p-2 text-left font-bold">Boot spans and seal check per side ({unit})</caption>
            <ColumnHeads
              names={['Side', 'Gap min', 'Gap max', 'Largest shear', 'Shortest span', 'Longest span', 'Extension ratio', 'Seal']}
              left={['Side', 'Seal']}
            />
            <tbody>
              {SIDES.map((side) => {
                const b = boot[side];
                const range = b.sealFreeHeightRangeMm
                  ? `free height ${formatLengthValue(b.sealFreeHeightRangeMm.min, unit)} to ${formatLengthValue(b.sealFreeHeightRangeMm.max, unit)} follows`
                  : 'no free height follows';
                return (
                  <tr key={side}>
                    <th scope="row" className="border border-rule p-2 text-left">
                      {SIDE_NAMES[side]}
                    </th>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.gapMinMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.gapMaxMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.largestShearMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.shortestMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.longestMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatRatio(b.extensionRatio)}</td>
                    <td className={`border border-rule p-2 text-left text-sm ${b.seal && !b.seal.follows ? 'bg-alert-light text-alert' : ''}`}>
                      {b.contact && <b>cab and body touch · </b>}
                      {b.seal ? `${b.seal.follows ? 'follows' : 'does not follow'}: ${sealReason(b.seal, b.gapMinMm, b.gapMaxMm, lengthWords(unit))}` : range}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {bootNote && <p className="text-sm">The spans {bootNote}.</p>}
        </div>
      )}
    </div>
  );
}
