import { Body, Container, Head, Hr, Html, Preview, Section, Text } from "@react-email/components";
import type { ReactNode } from "react";
import { emailColors } from "./email-colors";

export { emailColors };

export function EmailLayout({ preview, children }: { preview: string; children: ReactNode }) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{preview}</Preview>
      <Body style={{ backgroundColor: emailColors.paper, color: emailColors.ink, fontFamily: "Helvetica, Arial, sans-serif" }}>
        <Container style={{ maxWidth: 560, margin: "0 auto", padding: "24px" }}>
          <Text style={{ fontSize: 18, fontWeight: 700, color: emailColors.teal, margin: "0 0 16px" }}>Proofbay</Text>
          <Section style={{ backgroundColor: "#ffffff", borderRadius: 12, padding: "24px", border: "1px solid #e4e0d6" }}>
            {children}
          </Section>
          <Hr style={{ borderColor: "#e4e0d6", margin: "24px 0 12px" }} />
          <Text style={{ fontSize: 12, color: emailColors.muted }}>
            Harbor Street Print Lab · sent by Proofbay, the lab&apos;s test-funding site.
          </Text>
          {/* The per-message note (unsubscribe link or "always sent"), filled in by renderEmail. */}
          <div id="proofbay-email-footer" />
        </Container>
      </Body>
    </Html>
  );
}

