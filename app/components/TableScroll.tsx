/**
 * A box that lets a wide table scroll sideways on its own, so the page never scrolls sideways and the
 * table's columns are never squeezed until numbers break. Focusable and labelled, so a keyboard user
 * can scroll it too.
 */
export function TableScroll({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="table-scroll" role="region" aria-label={label} tabIndex={0}>
      {children}
    </div>
  );
}
