import { createElement, type ReactElement } from "react";
import { CampaignDateSlippedEmail, type CampaignDateSlippedProps } from "./campaign-date-slipped";
import { CampaignScheduledEmail, type CampaignScheduledProps } from "./campaign-scheduled";
import { CampaignLapsedRefundEmail, type CampaignLapsedRefundProps } from "./campaign-lapsed-refund";
import { CampaignWithdrawnRefundEmail, type CampaignWithdrawnRefundProps } from "./campaign-withdrawn-refund";
import { CampaignFundedEmail, type CampaignFundedProps } from "./pledge-campaign-funded";
import { MembershipReceiptEmail, type MembershipReceiptProps } from "./membership-receipt";
import { MembershipRenewalFailedEmail, type MembershipRenewalFailedProps } from "./membership-renewal-failed";
import { PledgeReceiptEmail, type PledgeReceiptProps } from "./pledge-receipt";
import { ReportPublishedEmail, type ReportPublishedProps } from "./report-published";
import { LabNoteEmail, type LabNoteProps } from "./lab-note";
import {
  ProposalAcceptedEmail,
  ProposalDeclinedEmail,
  ProposalMergedEmail,
  type ProposalAcceptedProps,
  type ProposalDeclinedProps,
  type ProposalMergedProps,
} from "./proposal-decided";

/** Every template the outbox can send, by the name stored with each queued message. */
export type TemplateProps = {
  "proposal-accepted": ProposalAcceptedProps;
  "proposal-declined": ProposalDeclinedProps;
  "proposal-merged": ProposalMergedProps;
  "pledge-receipt": PledgeReceiptProps;
  "campaign-funded": CampaignFundedProps;
  "membership-receipt": MembershipReceiptProps;
  "membership-renewal-failed": MembershipRenewalFailedProps;
  "report-published": ReportPublishedProps;
  "lab-note": LabNoteProps;
  "campaign-lapsed-refund": CampaignLapsedRefundProps;
  "campaign-withdrawn-refund": CampaignWithdrawnRefundProps;
  "campaign-scheduled": CampaignScheduledProps;
  "campaign-date-slipped": CampaignDateSlippedProps;
};
export type TemplateName = keyof TemplateProps;

const templates: { [K in TemplateName]: (props: TemplateProps[K]) => ReactElement } = {
  "proposal-accepted": (props) => createElement(ProposalAcceptedEmail, props),
  "proposal-declined": (props) => createElement(ProposalDeclinedEmail, props),
  "proposal-merged": (props) => createElement(ProposalMergedEmail, props),
  "pledge-receipt": (props) => createElement(PledgeReceiptEmail, props),
  "campaign-funded": (props) => createElement(CampaignFundedEmail, props),
  "membership-receipt": (props) => createElement(MembershipReceiptEmail, props),
  "membership-renewal-failed": (props) => createElement(MembershipRenewalFailedEmail, props),
  "report-published": (props) => createElement(ReportPublishedEmail, props),
  "lab-note": (props) => createElement(LabNoteEmail, props),
  "campaign-lapsed-refund": (props) => createElement(CampaignLapsedRefundEmail, props),
  "campaign-withdrawn-refund": (props) => createElement(CampaignWithdrawnRefundEmail, props),
  "campaign-scheduled": (props) => createElement(CampaignScheduledEmail, props),
  "campaign-date-slipped": (props) => createElement(CampaignDateSlippedEmail, props),
};

/** Every registered name; tests check each has a category in `lib/email/categories.ts`. */
export const templateNames = Object.keys(templates) as TemplateName[];

export function isTemplateName(name: string): name is TemplateName {
  return name in templates;
}

export function templateElement<K extends TemplateName>(name: K, props: TemplateProps[K]): ReactElement {
  return templates[name](props);
}
