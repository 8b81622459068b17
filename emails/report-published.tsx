import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type ReportPublishedProps = { name: string | null; campaignTitle: string; summary: string; reportUrl: string };

export function ReportPublishedEmail({ name, campaignTitle, summary, reportUrl }: ReportPublishedProps) {
  return (
    <EmailLayout preview={`The report on “${campaignTitle}” is published`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        The test you backed has its report
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>The lab has published what it learned from “{campaignTitle}”:</Text>
      <Text style={{ borderLeft: `3px solid ${emailColors.teal}`, paddingLeft: 12 }}>{summary}</Text>
      <Text>
        The report has the scorecard against the reference variant, the photos side by side and the lab&apos;s write-up. Backers can
        also judge blind pairs there.
      </Text>
      <Button href={reportUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        Read the report
      </Button>
    </EmailLayout>
  );
}
