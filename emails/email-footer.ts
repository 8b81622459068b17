import { emailColors } from "./email-colors";

/**
 * What the layout's footer says about why the mail came and how to stop it. The worker supplies
 * it per message (the unsubscribe link is personal), so templates pass nothing for it. It is
 * filled into the rendered HTML at the layout's slot rather than through React context, because
 * the templates are also imported where React's server build (without context) is in use.
 */
export type EmailFooter =
  | { kind: "account" }
  | { kind: "optional"; categoryLabel: string; unsubscribeUrl: string; preferencesUrl: string };

/** Rendered by EmailLayout exactly like this; renderEmail replaces it. */
export const FOOTER_SLOT = '<div id="proofbay-email-footer"></div>';

const escapes: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };
const escape = (value: string) => value.replace(/[&<>"']/g, (char) => escapes[char] ?? char);

export function footerHtml(footer: EmailFooter | undefined): string {
  if (!footer) return "";
  const style = `font-size:12px;line-height:18px;color:${emailColors.muted};margin:4px 0`;
  if (footer.kind === "account") {
    return `<p style="${style}">This is account mail about your own sign-in, pledge or membership. It is always sent.</p>`;
  }
  const label = escape(footer.categoryLabel);
  const link = (href: string, text: string) => `<a href="${escape(href)}" style="color:${emailColors.teal}">${text}</a>`;
  return (
    `<p style="${style}">You get “${label}” mail from Proofbay. ` +
    `${link(footer.unsubscribeUrl, `Unsubscribe from “${label}”`)} · ${link(footer.preferencesUrl, "Choose which mail you get")}</p>`
  );
}
