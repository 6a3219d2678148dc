/**
 * A mistake in the command line itself: an unknown option, a value of the wrong kind or outside its limits, a span
 * outside the record. `cpet` exits with status 2 for these (as for commander's own usage errors) and with 1 when the
 * command was well formed but a file cannot be read or used, so a script can tell "fix the command" from "fix the file".
 */
export class UsageError extends Error {
  override name = "UsageError";
}

/** Exit statuses of `cpet`, shown in the help of each command. */
export const EXIT_STATUS_HELP = `
Exit status: 0 done; 1 a file cannot be read or used (the message says why); 2 the command itself is wrong (an unknown
option, or a value of the wrong kind or outside its limits).`;
