"use client";

/** Said when values typed earlier and not saved were put back on a form (`useKeptForm`), with a way to drop them. */
export function KeptNotice({ kept, testId }: { kept: { restored: boolean; discard: () => void }; testId: string }) {
  if (!kept.restored) return null;
  return (
    <p className="panel sev-warning" role="status" data-testid={testId}>
      Values you typed here earlier were not saved and have been put back.{" "}
      <button type="button" className="secondary" onClick={kept.discard}>
        Discard them
      </button>
    </p>
  );
}
