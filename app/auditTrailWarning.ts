import "server-only";
import { auditTrailStatus, type AuditTrailStatus } from "@/lib/store/auditTrail";

/**
 * What the masthead says about the audit trail when it cannot be trusted: an entry that does not fit the hash chain,
 * or guards (triggers) removed from the database file. Empty when all is well.
 */
export function auditTrailWarning(status: AuditTrailStatus = auditTrailStatus()): string[] {
  const out: string[] = [];
  if (!status.ok)
    out.push(
      `The audit trail has been altered outside this app: ${status.reason ?? `entry ${status.firstBrokenId} does not fit`}. ` +
        "Keep a copy of the database file as it is now, and have whoever keeps this installation run 'cpet audit verify'.",
    );
  if (status.missingGuards.length > 0)
    out.push(
      `The audit trail's guards were removed from the database (${status.missingGuards.join(", ")}), so it no longer ` +
        "refuses changes to past entries; the hash chain still shows changes made without this app.",
    );
  return out;
}
