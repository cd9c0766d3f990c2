/** How long a download link works: a week gives a customer time to fetch a large order (our choice). */
export const downloadLinkDays = 7;
export const downloadLinkValidMs = downloadLinkDays * 24 * 3600_000;

/** The absolute URL of a download link's token. */
export function downloadUrl(publicUrl: string, token: string): string {
  return `${publicUrl}/api/downloads/${encodeURIComponent(token)}`;
}
