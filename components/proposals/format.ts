/** "today", "yesterday", "5 days ago", "3 months ago" — how long ago a proposal reached the lab. */
export function formatAge(date: Date, now: Date): string {
  const days = Math.floor((now.getTime() - date.getTime()) / 86_400_000);
  if (days < 1) return "today";
  if (days < 2) return "yesterday";
  if (days < 60) return `${days} days ago`;
  const months = Math.floor(days / 30.44);
  if (months < 24) return `${months} months ago`;
  return `${Math.floor(days / 365.25)} years ago`;
}

/** File sizes in the units the upload limits use: "64 MB" there is 64 × 1024 × 1024 bytes. */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${Math.round(bytes / 1024)} kB`;
  return `${(bytes / (1024 * 1024)).toLocaleString("en-US", { maximumFractionDigits: 1 })} MB`;
}

export function formatVotes(count: number): string {
  return `${count} ${count === 1 ? "vote" : "votes"}`;
}
