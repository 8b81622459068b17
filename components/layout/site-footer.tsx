export function SiteFooter() {
  return (
    <footer className="mt-16 border-t border-line bg-surface">
      <div className="mx-auto grid max-w-6xl gap-4 px-4 py-8 text-sm text-muted sm:grid-cols-2 sm:px-6">
        <p>
          <strong className="text-ink">Printing is hot and smoky work.</strong> Nozzles and beds burn; heated plastics give
          off fumes and ultrafine particles (ABS and ASA above all), so ventilate; never leave a printer running unattended
          without fire precautions; wear hearing protection near loud blower fans; PTFE-lined hotends should stay below
          about 240 °C.
        </p>
        <p>
          Pledges and memberships are money. Proofbay refunds every pledge when a campaign falls short, but refunds, receipts,
          taxes and fundraising rules vary by place — follow local law and ask a licensed adviser where it matters.
        </p>
      </div>
    </footer>
  );
}
