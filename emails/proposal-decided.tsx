import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type ProposalDeclinedProps = { name: string | null; proposalTitle: string; reason: string; proposalUrl: string };

export function ProposalDeclinedEmail({ name, proposalTitle, reason, proposalUrl }: ProposalDeclinedProps) {
  return (
    <EmailLayout preview={`The lab will not test “${proposalTitle}”`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        Your proposal was declined
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        Thank you for proposing “{proposalTitle}”. The lab has decided not to test it. Their reason:
      </Text>
      <Text style={{ borderLeft: `3px solid ${emailColors.teal}`, paddingLeft: 12, fontStyle: "italic" }}>{reason}</Text>
      <Button href={proposalUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        See the proposal
      </Button>
    </EmailLayout>
  );
}

export type ProposalMergedProps = { name: string | null; proposalTitle: string; survivorTitle: string; survivorUrl: string };

export function ProposalMergedEmail({ name, proposalTitle, survivorTitle, survivorUrl }: ProposalMergedProps) {
  return (
    <EmailLayout preview={`“${proposalTitle}” joined “${survivorTitle}”`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        Your proposal was merged
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        The lab found that “{proposalTitle}” asks for the same test as “{survivorTitle}”, so it merged the two. Its votes and
        followers — you included — now count toward “{survivorTitle}”.
      </Text>
      <Button href={survivorUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        Follow “{survivorTitle}”
      </Button>
    </EmailLayout>
  );
}

export type ProposalAcceptedProps = { name: string | null; proposalTitle: string; proposalUrl: string };

export function ProposalAcceptedEmail({ name, proposalTitle, proposalUrl }: ProposalAcceptedProps) {
  return (
    <EmailLayout preview={`The lab accepted “${proposalTitle}”`}>
      <Heading as="h1" style={{ fontSize: 20, margin: "0 0 12px" }}>
        Your proposal was accepted
      </Heading>
      <Text>{name ? `Hi ${name},` : "Hello,"}</Text>
      <Text>
        The lab accepted “{proposalTitle}” and is writing its test plan. When the campaign opens for pledges you will find it on
        the board.
      </Text>
      <Button href={proposalUrl} style={{ color: emailColors.teal, fontWeight: 600 }}>
        See the proposal
      </Button>
    </EmailLayout>
  );
}
