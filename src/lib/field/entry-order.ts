// Enter (or the keyboard's Next) moves to the next entry of the page. The order is the page's own
// order of fields marked `data-entry`, so a screen sets the order by how it lays its fields out
// (and says why there), and the Tab order and the Enter order never disagree.

const ENTRY = '[data-entry]';

/** The entry after `from` that can take typing, or null at the end of the page. */
export function nextEntry(from: HTMLElement): HTMLElement | null {
  const all = [...document.querySelectorAll<HTMLElement>(ENTRY)].filter(
    (el) => !(el as HTMLInputElement).disabled && !(el as HTMLInputElement).readOnly && el.getClientRects().length > 0,
  );
  const at = all.indexOf(from);
  return at >= 0 ? (all[at + 1] ?? null) : null;
}

/** Moves the focus on, or lets the keyboard go after the last entry. */
export function focusNextEntry(from: HTMLElement) {
  const next = nextEntry(from);
  if (next) next.focus();
  else from.blur();
}
