/** Display formatting. Numbers are rounded only here, never inside the engine. */
export function formatNumber(value: number | null | undefined, decimals = 0): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return value.toFixed(decimals);
}

/** m:ss from seconds, e.g. 754 → "12:34". Negative times (rest before exercise) keep a minus sign. */
export function formatClock(seconds: number): string {
  const sign = seconds < 0 ? "-" : "";
  const s = Math.round(Math.abs(seconds));
  const m = Math.floor(s / 60);
  return `${sign}${m}:${String(s % 60).padStart(2, "0")}`;
}

/**
 * An ISO 8601 UTC time to the minute, as the product prints times of signing, saving and upload: "2026-12-05 01:40 UTC".
 */
export function formatUtcMinute(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}
