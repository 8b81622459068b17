import { createElement, type ReactElement } from "react";
import { CampaignFundedEmail, type CampaignFundedProps } from "./pledge-campaign-funded";
import { PledgeReceiptEmail, type PledgeReceiptProps } from "./pledge-receipt";
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
};
export type TemplateName = keyof TemplateProps;

const templates: { [K in TemplateName]: (props: TemplateProps[K]) => ReactElement } = {
  "proposal-accepted": (props) => createElement(ProposalAcceptedEmail, props),
  "proposal-declined": (props) => createElement(ProposalDeclinedEmail, props),
  "proposal-merged": (props) => createElement(ProposalMergedEmail, props),
  "pledge-receipt": (props) => createElement(PledgeReceiptEmail, props),
  "campaign-funded": (props) => createElement(CampaignFundedEmail, props),
};

export function isTemplateName(name: string): name is TemplateName {
  return name in templates;
}

export function templateElement<K extends TemplateName>(name: K, props: TemplateProps[K]): ReactElement {
  return templates[name](props);
}
