import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type LabNoteProps = { name: string | null; campaignTitle: string; bodyMd: string; authorName: string | null; campaignUrl: string };

/** Paragraphs of the note as typed; markdown marks stay as plain text, which reads fine in mail. */
function paragraphs(markdown: string): string[] {
  return markdown
    .split(/\n\s*\n/)
    .map((block) => block.trim())
    .filter(Boolean);
}

export function LabNoteEmail({ name, campaignTitle, bodyMd, authorName, campaignUrl }: LabNoteProps) {
  return (
    <EmailLayout preview={`A note from the lab on “${campaignTitle}”`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        A note from the lab
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>{authorName ? `${authorName} posted` : "The lab posted"} a note on “{campaignTitle}”, the test you backed:</Text>
      {paragraphs(bodyMd).map((paragraph, i) => (
        <Text key={i} style={{ borderLeft: `3px solid ${emailColors.teal}`, paddingLeft: 12, whiteSpace: "pre-line" }}>
          {paragraph}
        </Text>
      ))}
      <Button href={campaignUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        See the campaign
      </Button>
    </EmailLayout>
  );
}
