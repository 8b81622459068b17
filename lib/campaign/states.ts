export type CampaignStateName = "open" | "funded" | "lapsed" | "withdrawn" | "queued" | "printing" | "reported";

export const campaignStateLabels: Record<CampaignStateName, string> = {
  open: "Open for pledges",
  funded: "Funded",
  lapsed: "Lapsed — refunded",
  withdrawn: "Withdrawn — refunded",
  queued: "In the print queue",
  printing: "Printing",
  reported: "Report published",
};

/** Board order: what a supporter can still act on first, then work in progress, then history. */
export const campaignStateOrder: Record<CampaignStateName, number> = {
  open: 0,
  printing: 1,
  queued: 2,
  funded: 3,
  reported: 4,
  lapsed: 5,
  withdrawn: 6,
};
