import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type MembershipReceiptProps = {
  name: string | null;
  planName: string;
  /** Formatted when queued, e.g. "$12". */
  amount: string;
  /** The payment's date, and the end of the month it pays for, in the lab's time zone. */
  paidOn: string;
  periodEnd: string;
  /** False for the first month, true for each renewal. */
  renewal: boolean;
  invoiceRef: string;
  monthlyVotes: number;
  earlyBlindPairs: boolean;
  membershipUrl: string;
};

export function MembershipReceiptEmail({ name, planName, amount, paidOn, periodEnd, renewal, invoiceRef, monthlyVotes, earlyBlindPairs, membershipUrl }: MembershipReceiptProps) {
  return (
    <EmailLayout preview={renewal ? `Your ${planName} membership renewed: ${amount}` : `Welcome to the Filament Club: ${planName}, ${amount} a month`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        {renewal ? "Your membership renewed" : "Welcome to the Filament Club"}
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        {renewal ? `Your Filament Club ${planName} membership renewed` : `You joined the Filament Club on the ${planName} plan`}: {amount} was
        paid on {paidOn}, and your membership runs until {periodEnd}. Invoice reference: {invoiceRef}.
      </Text>
      <Text>
        Your perks: {monthlyVotes} proposal vote{monthlyVotes === 1 ? "" : "s"} a month
        {earlyBlindPairs ? ", and judging blind pairs before they open to everyone" : ""}. Every membership payment goes to the lab
        fund, which the lab allocates to campaigns.
      </Text>
      <Button href={membershipUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        See your membership
      </Button>
      <Text style={{ fontSize: 13, color: emailColors.muted }}>
        You can cancel at any time from {membershipUrl}; the membership then runs to the end of the month already paid for. This
        message confirms a payment; it is not a tax document. Rules on receipts and taxes vary by place — defer to local law and
        licensed advice.
      </Text>
    </EmailLayout>
  );
}
