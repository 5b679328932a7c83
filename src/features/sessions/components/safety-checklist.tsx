import { useState } from 'react';
import { SafetyNotice } from '@/components/safety-notice';

/** Common practice for flex testing; each item is ticked before the first pose. */
export const SAFETY_ITEMS = [
  'A spotter is in clear sight of the driver, with agreed hand signals.',
  'Nobody stands beside or under the vehicle while it moves.',
  'Hands stay out of the cab-to-body gap while the chassis is loaded.',
  'Wheels are chocked and the parking brake set whenever the vehicle stops on an obstacle.',
  'The approach is slow.',
  'We stop at the first sign of tyre-to-body or driveline contact.',
  'Nobody works under a vehicle held only by a jack.',
] as const;

/** The checklist; `onLeftChange` hears how many items are still unticked (0 when all are). */
export function SafetyChecklist({ onLeftChange }: { onLeftChange: (left: number) => void }) {
  const [ticked, setTicked] = useState<boolean[]>(SAFETY_ITEMS.map(() => false));
  return (
    <fieldset className="card space-y-2">
      <legend className="px-1 text-lg font-bold">Safety checklist</legend>
      {SAFETY_ITEMS.map((item, i) => (
        <label key={item} className="flex min-h-touch items-center gap-3">
          <input
            type="checkbox"
            className="h-7 w-7 shrink-0"
            checked={ticked[i]}
            onChange={(e) => {
              const next = ticked.map((t, k) => (k === i ? e.target.checked : t));
              setTicked(next);
              onLeftChange(next.filter((t) => !t).length);
            }}
          />
          <span>{item}</span>
        </label>
      ))}
      <SafetyNotice compact />
    </fieldset>
  );
}

export const safetyItemsLeft = (left: number) => `${left} safety item${left === 1 ? '' : 's'} left`;
