import type { BootSpanResult, EnvelopeResult } from '@shared/flex';
import type { UnitSystem } from '@shared/schemas/common';
import { AXIS_NAMES, SIDE_NAMES, formatLengthValue, formatRatio } from '@shared/format';

const AXES = ['foreAft', 'lateral', 'vertical'] as const;
const SIDES = ['top', 'bottom', 'left', 'right'] as const;

interface Props {
  result: EnvelopeResult;
  boot: BootSpanResult | null;
  bootNote: string | null;
  unit: UnitSystem;
}

/** The envelope per axis with the term that governs and why, then the boot spans and seal check per side. */
export function EnvelopeResults({ result, boot, bootNote, unit }: Props) {
  return (
    <div className="space-y-4">
      {/* Focusable so a keyboard can scroll a table wider than a phone. */}
      <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Design envelope, scrollable">
        <table className="min-w-full border-collapse bg-white text-right" aria-label="Design envelope">
          <caption className="p-2 text-left font-bold">Design envelope per axis ({unit})</caption>
          <thead>
            <tr>
              <th scope="col" className="border border-rule p-2 text-left">Axis</th>
              <th scope="col" className="border border-rule p-2">Measured worst</th>
              <th scope="col" className="border border-rule p-2">Upper bound</th>
              <th scope="col" className="border border-rule p-2 text-left">Governs</th>
              <th scope="col" className="border border-rule p-2">Envelope</th>
            </tr>
          </thead>
          <tbody>
            {AXES.map((axis) => {
              const a = result.axes[axis];
              return (
                <tr key={axis} data-axis={axis}>
                  <th scope="row" className="border border-rule p-2 text-left">{AXIS_NAMES[axis]}</th>
                  <td className="border border-rule p-2 tabular-nums">{formatLengthValue(Math.abs(a.measuredWorstMm), unit)}</td>
                  <td className="border border-rule p-2 tabular-nums">{a.upperBoundMm === null ? '—' : formatLengthValue(a.upperBoundMm, unit)}</td>
                  <td className="border border-rule p-2 text-left">{a.governing === 'upperBound' ? 'upper bound' : 'measured'}</td>
                  <td className="border border-rule p-2 text-lg font-bold tabular-nums" data-testid={`envelope-${axis}`}>±{formatLengthValue(a.envelopeMm, unit)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <div>
        <h4 className="font-bold">Why these values</h4>
        <ul className="list-disc pl-6 text-sm">
          {AXES.map((axis) => (
            <li key={axis}>
              <b>{AXIS_NAMES[axis]}</b>: {result.axes[axis].reasons.join(' ')}
            </li>
          ))}
        </ul>
        {result.notes.length > 0 && (
          <>
            <h4 className="mt-2 font-bold">Remarks</h4>
            <ul className="list-disc pl-6 text-sm">
              {result.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          </>
        )}
      </div>
      {boot === null ? (
        <p>{bootNote}</p>
      ) : (
        <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Boot spans, scrollable">
          <table className="min-w-full border-collapse bg-white text-right" aria-label="Boot spans">
            <caption className="p-2 text-left font-bold">Boot spans and seal check per side ({unit})</caption>
            <thead>
              <tr>
                <th scope="col" className="border border-rule p-2 text-left">Side</th>
                <th scope="col" className="border border-rule p-2">Gap min</th>
                <th scope="col" className="border border-rule p-2">Gap max</th>
                <th scope="col" className="border border-rule p-2">Largest shear</th>
                <th scope="col" className="border border-rule p-2">Shortest span</th>
                <th scope="col" className="border border-rule p-2">Longest span</th>
                <th scope="col" className="border border-rule p-2">Extension ratio</th>
                <th scope="col" className="border border-rule p-2 text-left">Seal</th>
              </tr>
            </thead>
            <tbody>
              {SIDES.map((side) => {
                const b = boot[side];
                const range = b.sealFreeHeightRangeMm ? `free height ${formatLengthValue(b.sealFreeHeightRangeMm.min, unit)} to ${formatLengthValue(b.sealFreeHeightRangeMm.max, unit)} follows` : 'no free height follows';
                return (
                  <tr key={side}>
                    <th scope="row" className="border border-rule p-2 text-left">{SIDE_NAMES[side]}</th>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.gapMinMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.gapMaxMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.largestShearMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.shortestMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatLengthValue(b.longestMm, unit)}</td>
                    <td className="border border-rule p-2 tabular-nums">{formatRatio(b.extensionRatio)}</td>
                    <td className={`border border-rule p-2 text-left text-sm ${b.seal && !b.seal.follows ? 'bg-alert-light text-alert' : ''}`}>
                      {b.contact && <b>cab and body touch · </b>}
                      {b.seal ? `${b.seal.follows ? 'follows' : 'does not follow'}: ${b.seal.reason}` : range}
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
