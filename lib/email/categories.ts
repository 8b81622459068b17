/**
 * The kinds of mail a supporter can choose to receive, and which kind each template is. Account
 * mail (sign-in, receipts, refunds, renewal failures) is always sent: it is about the person's own
 * account or money, so it carries no unsubscribe link and cannot be turned off.
 */
export const emailCategories = ["account", "proposals", "funding", "campaign-updates", "reports"] as const;
export type EmailCategory = (typeof emailCategories)[number];
export type OptionalEmailCategory = Exclude<EmailCategory, "account">;

export const optionalEmailCategories = emailCategories.filter((category): category is OptionalEmailCategory => category !== "account");

export const emailCategoryInfo: Record<EmailCategory, { label: string; description: string }> = {
  account: {
    label: "Account and payments",
    description: "Sign-in links, pledge and membership receipts, refunds and failed renewals. Always sent.",
  },
  proposals: { label: "Your proposals", description: "When the lab accepts, declines or merges a test you proposed." },
  funding: { label: "Funding news", description: "When a campaign you backed reaches its goal." },
  "campaign-updates": {
    label: "Campaign updates",
    description: "Print dates for campaigns you backed, when a date slips, and the lab's notes between funding and report.",
  },
  reports: { label: "Reports", description: "When the report of a campaign you backed is published." },
};

/**
 * Every template name, registered or planned, mapped to its category in one place. A template
 * missing here is caught by tests/unit/email-categories.test.ts.
 */
export const templateCategories: Readonly<Record<string, EmailCategory>> = {
  "sign-in-link": "account",
  "pledge-receipt": "account",
  "campaign-lapsed-refund": "account",
  "campaign-withdrawn-refund": "account",
  "membership-receipt": "account",
  "membership-renewal-failed": "account",
  "proposal-accepted": "proposals",
  "proposal-declined": "proposals",
  "proposal-merged": "proposals",
  "campaign-funded": "funding",
  "campaign-scheduled": "campaign-updates",
  "campaign-date-slipped": "campaign-updates",
  "lab-note": "campaign-updates",
  "report-published": "reports",
};

export function hasEmailCategory(template: string): boolean {
  return Object.hasOwn(templateCategories, template);
}

/**
 * The category a template's mail is sent under. An unmapped template is treated as account mail
 * so that queuing never fails inside someone's payment or decision; the test above keeps the map whole.
 */
export function emailCategoryOf(template: string): EmailCategory {
  return hasEmailCategory(template) ? templateCategories[template]! : "account";
}

export function isOptionalCategory(category: string): category is OptionalEmailCategory {
  return (optionalEmailCategories as readonly string[]).includes(category);
}
