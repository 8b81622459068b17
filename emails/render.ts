import { render, toPlainText } from "@react-email/components";
import type { ReactElement } from "react";
import { FOOTER_SLOT, footerHtml, type EmailFooter } from "./email-footer";

export type RenderedEmail = { html: string; text: string };

/**
 * Renders a template to the HTML and plain-text parts every Proofbay e-mail carries, with the
 * footer note filled in. The text part is converted from the finished HTML (as react-email's own
 * plain-text option does) rather than rendered a second time, which halves the cost of a fan-out.
 */
export async function renderEmail(element: ReactElement, footer?: EmailFooter): Promise<RenderedEmail> {
  const html = (await render(element)).replace(FOOTER_SLOT, footerHtml(footer));
  return { html, text: toPlainText(html) };
}
