import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type PledgeReceiptProps = {
  name: string | null;
  campaignTitle: string;
  /** Formatted when queued, e.g. "$25". */
  amount: string;
  /** The payment's date in the lab's time zone. */
  paidOn: string;
  pledgeId: string;
  campaignUrl: string;
  pledgesUrl: string;
};

export function PledgeReceiptEmail({ name, campaignTitle, amount, paidOn, pledgeId, campaignUrl, pledgesUrl }: PledgeReceiptProps) {
  return (
    <EmailLayout preview={`Your pledge of ${amount} to “${campaignTitle}” is confirmed`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        Your pledge is confirmed
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        Thank you: your pledge of {amount} to “{campaignTitle}” was paid on {paidOn}. Pledge reference: {pledgeId}.
      </Text>
      <Text>
        Goal-or-refund: if the campaign does not reach its goal by the deadline, or the lab withdraws it, your pledge is refunded
        in full, automatically.
      </Text>
      <Button href={campaignUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        Follow the campaign
      </Button>
      <Text style={{ fontSize: 13, color: emailColors.muted }}>
        All your pledges are listed at {pledgesUrl}. This message confirms a payment; it is not a tax document. Rules on receipts,
        taxes and fundraising vary by place — defer to local law and licensed advice.
      </Text>
    </EmailLayout>
  );
}
