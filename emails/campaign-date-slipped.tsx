import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type CampaignDateSlippedProps = {
  name: string | null;
  campaignTitle: string;
  /** Both dates already formatted in the lab's time zone. */
  previousDate: string;
  newDate: string;
  timeZone: string;
  /** What moved the queue, when the lab knows it (e.g. a printer taken down for repair). */
  reason: string | null;
  campaignUrl: string;
};

export function CampaignDateSlippedEmail({ name, campaignTitle, previousDate, newDate, timeZone, reason, campaignUrl }: CampaignDateSlippedProps) {
  return (
    <EmailLayout preview={`“${campaignTitle}”: results now expected ${newDate}`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        The results date has moved
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        {`The results of “${campaignTitle}” are now expected on `}
        <strong>{newDate}</strong>
        {` instead of ${previousDate} (lab time, ${timeZone}).`}
      </Text>
      {reason ? (
        <Text style={{ borderLeft: `3px solid ${emailColors.teal}`, paddingLeft: 12 }}>Why: {reason}</Text>
      ) : (
        <Text style={{ color: emailColors.muted }}>The print queue changed: jobs ahead took longer, or a printer was taken out of use.</Text>
      )}
      <Text style={{ color: emailColors.muted }}>Nothing changes about your pledge; the campaign page always shows the latest date.</Text>
      <Button href={campaignUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        See the campaign
      </Button>
    </EmailLayout>
  );
}
