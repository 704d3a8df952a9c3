/**
 * What Tab can reach inside a dialog: the controls a keyboard user can focus, in document order,
 * leaving out disabled and hidden ones (a collapsed section's inputs, a step not shown yet).
 */
const FOCUSABLE = 'a[href], button:not([disabled]), input:not([disabled]):not([type=hidden]), select:not([disabled]), textarea:not([disabled]), summary, [tabindex]:not([tabindex="-1"])';

export function focusablesIn(root: ParentNode): HTMLElement[] {
  const out: HTMLElement[] = [];
  for (const el of root.querySelectorAll<HTMLElement>(FOCUSABLE)) {
    // getClientRects is empty for display:none and for anything inside a closed <details>.
    if (el.getClientRects().length > 0) out.push(el);
  }
  return out;
}
