/** The Proofbay mark: three stacked layer lines over a bed, drawn inline so nothing is fetched. */
export function Logo({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden="true" className={className}>
      <rect x="2" y="26" width="28" height="4" rx="2" fill="currentColor" opacity="0.35" />
      <rect x="7" y="19" width="18" height="4" rx="2" fill="currentColor" />
      <rect x="9" y="12" width="14" height="4" rx="2" fill="currentColor" />
      <rect x="11" y="5" width="10" height="4" rx="2" fill="#c2541b" />
    </svg>
  );
}
