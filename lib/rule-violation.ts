/**
 * A request that is well formed but not allowed by Proofbay's rules (someone else's proposal, a
 * second vote, a merge into a declined proposal). Route handlers turn it into its status.
 */
export class RuleViolation extends Error {
  constructor(
    readonly status: 403 | 404 | 409 | 422,
    readonly code: string,
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = "RuleViolation";
  }
}
