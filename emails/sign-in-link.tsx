import { Button, Heading, Text } from "@react-email/components";
import { EmailLayout, emailColors } from "./email-layout";

export type SignInLinkProps = { url: string; minutesValid: number };

export function SignInLinkEmail({ url, minutesValid }: SignInLinkProps) {
  return (
    <EmailLayout preview="Your Proofbay sign-in link">
      <Heading as="h1" style={{ fontSize: 22, margin: "0 0 12px" }}>
        Sign in to Proofbay
      </Heading>
      <Text>Open the link below, then press the button on the page it opens to finish signing in.</Text>
      <Button
        href={url}
        style={{ backgroundColor: emailColors.teal, color: "#ffffff", padding: "12px 20px", borderRadius: 8, fontWeight: 600 }}
      >
        Continue to sign in
      </Button>
      <Text style={{ fontSize: 13, color: emailColors.muted }}>
        The link works once and expires in {minutesValid} minutes. If you did not ask to sign in, ignore this e-mail.
      </Text>
      <Text style={{ fontSize: 12, color: emailColors.muted, wordBreak: "break-all" }}>{url}</Text>
    </EmailLayout>
  );
}
