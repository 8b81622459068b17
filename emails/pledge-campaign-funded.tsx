import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type CampaignFundedProps = { name: string | null; campaignTitle: string; goal: string; campaignUrl: string };

export function CampaignFundedEmail({ name, campaignTitle, goal, campaignUrl }: CampaignFundedProps) {
  return (
    <EmailLayout preview={`“${campaignTitle}” reached its goal`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        The campaign you backed is funded
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        “{campaignTitle}” reached its goal of {goal}. The lab will now schedule its prints; the campaign page shows an estimated
        results date, which moves when the print queue moves.
      </Text>
      <Button href={campaignUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        See the campaign
      </Button>
    </EmailLayout>
  );
}
