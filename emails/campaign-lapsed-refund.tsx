import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type CampaignLapsedRefundProps = {
  name: string | null;
  campaignTitle: string;
  /** Formatted when queued, e.g. "$25". */
  amount: string;
  goal: string;
  /** The deadline's date and the refund's date, in the lab's time zone. */
  deadline: string;
  refundedOn: string;
  pledgeId: string;
  campaignUrl: string;
  pledgesUrl: string;
};

export function CampaignLapsedRefundEmail({ name, campaignTitle, amount, goal, deadline, refundedOn, pledgeId, campaignUrl, pledgesUrl }: CampaignLapsedRefundProps) {
  return (
    <EmailLayout preview={`Your ${amount} for “${campaignTitle}” is refunded`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        Your pledge is refunded
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        “{campaignTitle}” did not reach its goal of {goal} by its deadline on {deadline}, so the test will not run this time.
        Goal-or-refund: your pledge of {amount} was refunded in full on {refundedOn}. Pledge reference: {pledgeId}.
      </Text>
      <Text>
        Card refunds usually take 5 to 10 business days to appear on a statement, depending on the bank.
      </Text>
      <Button href={campaignUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        See the campaign
      </Button>
      <Text style={{ fontSize: 13, color: emailColors.muted }}>
        All your pledges and refunds are listed at {pledgesUrl}. This message confirms a refund; it is not a tax document. Rules
        on refunds, receipts and taxes vary by place — defer to local law and licensed advice.
      </Text>
    </EmailLayout>
  );
}
