import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type CampaignScheduledProps = {
  name: string | null;
  campaignTitle: string;
  /** The estimated results date, already formatted in the lab's time zone. */
  resultsOn: string;
  timeZone: string;
  jobs: number;
  campaignUrl: string;
};

export function CampaignScheduledEmail({ name, campaignTitle, resultsOn, timeZone, jobs, campaignUrl }: CampaignScheduledProps) {
  return (
    <EmailLayout preview={`“${campaignTitle}”: results expected ${resultsOn}`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        The campaign you backed is in the print queue
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        {`The lab has scheduled the ${jobs} ${jobs === 1 ? "print" : "prints"} of “${campaignTitle}”. Results are expected on `}
        <strong>{resultsOn}</strong>
        {` (lab time, ${timeZone}).`}
      </Text>
      <Text style={{ color: emailColors.muted }}>
        This is an estimate: it moves when the queue moves (a failed print, a printer in repair). If it moves later by more than a
        few days, we will write again.
      </Text>
      <Button href={campaignUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        Follow the campaign
      </Button>
    </EmailLayout>
  );
}
