import { CampaignCard } from "@/components/campaign-card";
import { getDb } from "@/db";
import { getLabSettings, listBoardCampaigns, type BoardCampaign } from "@/db/queries/campaigns";
import { campaignStateOrder } from "@/lib/campaign/states";

const sections: { title: string; states: BoardCampaign["state"][]; empty: string }[] = [
  { title: "Open for pledges", states: ["open"], empty: "No campaign is taking pledges right now." },
  { title: "Funded and in the lab", states: ["funded", "queued", "printing"], empty: "Nothing is in the lab at the moment." },
  { title: "Finished", states: ["reported", "lapsed", "withdrawn"], empty: "No finished campaigns yet." },
];

export default function BoardPage() {
  const db = getDb();
  const settings = getLabSettings(db);
  const campaigns = listBoardCampaigns(db).sort((a, b) => campaignStateOrder[a.state] - campaignStateOrder[b.state]);
  const now = new Date();

  return (
    <div className="flex flex-col gap-10">
      <section className="max-w-3xl">
        <h1 className="text-3xl font-bold tracking-tight sm:text-4xl">Tests our audience pays for</h1>
        <p className="mt-3 text-lg text-muted">
          {settings.labName} prints the same test pieces with each part or filament under test and with a reference, photographs
          them under the same light and publishes what it learned. Each campaign below is one such test: pledge toward its
          goal before the deadline — if it falls short, every pledge is refunded.
        </p>
      </section>
      {sections.map((section) => {
        const rows = campaigns.filter((campaign) => section.states.includes(campaign.state));
        return (
          <section key={section.title} aria-labelledby={`section-${section.states[0]}`}>
            <h2 id={`section-${section.states[0]}`} className="mb-4 text-xl font-semibold">
              {section.title} <span className="font-normal text-muted">({rows.length})</span>
            </h2>
            {rows.length === 0 ? (
              <p className="text-muted">{section.empty}</p>
            ) : (
              <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
                {rows.map((campaign) => (
                  <li key={campaign.id} className="relative flex">
                    <CampaignCard campaign={campaign} now={now} timeZone={settings.timeZone} />
                  </li>
                ))}
              </ul>
            )}
          </section>
        );
      })}
    </div>
  );
}
