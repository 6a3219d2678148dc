/** The cautions live in lib/core so every layer uses the same words; re-exported here for the report. */
export { CLINICAL_CAUTION, DRAFT_CAUTION } from "../core/cautions";

/**
 * Beside every signature: the signer's name is what they typed. This installation has no log-in (DEVELOPERS.md), so
 * nothing proves who signed; a site that needs that puts the app behind its own sign-in.
 */
export const SIGNER_NOT_VERIFIED =
  "The signer's name is as typed at signing: this installation had no log-in, so the name is not verified.";

/** Beside a signature made while signed in: the name is the account's, set when the account was made (`cpet account add`). */
export function signerIdentityNote(signerAccount: string | null | undefined): string {
  return signerAccount
    ? `The signer was signed in as the account "${signerAccount}"; the name is that account's, as set by whoever made the account.`
    : SIGNER_NOT_VERIFIED;
}
