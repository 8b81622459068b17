import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type CampaignWithdrawnRefundProps = {
  name: string | null;
  campaignTitle: string;
  /** Formatted when queued, e.g. "$25". */
  amount: string;
  /** The host's reason, as written when withdrawing. */
  reason: string;
  /** The refund's date in the lab's time zone. */
  refundedOn: string;
  pledgeId: string;
  campaignUrl: string;
  pledgesUrl: string;
};

export function CampaignWithdrawnRefundEmail({ name, campaignTitle, amount, reason, refundedOn, pledgeId, campaignUrl, pledgesUrl }: CampaignWithdrawnRefundProps) {
  return (
    <EmailLayout preview={`The lab withdrew “${campaignTitle}”: your ${amount} is refunded`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        The lab withdrew this campaign
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>The lab has withdrawn “{campaignTitle}” and will not run this test. In the lab&apos;s words:</Text>
      <Text style={{ borderLeft: `3px solid ${emailColors.teal}`, paddingLeft: 12, fontStyle: "italic" }}>{reason}</Text>
      <Text>
        Goal-or-refund: your pledge of {amount} was refunded in full on {refundedOn}. Pledge reference: {pledgeId}. Card refunds
        usually take 5 to 10 business days to appear on a statement, depending on the bank.
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
