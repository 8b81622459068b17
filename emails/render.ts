import { render } from "@react-email/components";
import type { ReactElement } from "react";

export type RenderedEmail = { html: string; text: string };

/** Renders a template to the HTML and plain-text parts every Proofbay e-mail carries. */
export async function renderEmail(element: ReactElement): Promise<RenderedEmail> {
  const [html, text] = await Promise.all([render(element), render(element, { plainText: true })]);
  return { html, text };
}
