import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type MembershipRenewalFailedProps = {
  name: string | null;
  planName: string;
  /** Formatted when queued, e.g. "$12". */
  amount: string;
  failedOn: string;
  /** When the card processor tries again, if it said. */
  nextAttemptOn: string | null;
  invoiceRef: string;
  membershipUrl: string;
};

export function MembershipRenewalFailedEmail({ name, planName, amount, failedOn, nextAttemptOn, invoiceRef, membershipUrl }: MembershipRenewalFailedProps) {
  return (
    <EmailLayout preview={`Your ${planName} renewal of ${amount} did not go through`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        Your renewal did not go through
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        On {failedOn} the card processor could not charge {amount} for your Filament Club {planName} membership (invoice reference{" "}
        {invoiceRef}). Until the payment goes through, your membership perks — proposal votes and early blind pairs — are paused.
      </Text>
      <Text>
        {nextAttemptOn ? `The card processor will try the card again around ${nextAttemptOn}.` : "The card processor will try the card again."} If
        the card has expired or been replaced, update it with your bank or card issuer; nothing is charged twice.
      </Text>
      <Button href={membershipUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        See your membership
      </Button>
      <Text style={{ fontSize: 13, color: emailColors.muted }}>
        Do not want to continue? Cancel from {membershipUrl}; no further payment is taken.
      </Text>
    </EmailLayout>
  );
}
