/** How long a download link works, in milliseconds, from DOWNLOAD_LINK_HOURS (config.downloadLinkHours). */
export function downloadLinkValidMs(hours: number): number {
  return hours * 3600_000;
}

/** The absolute URL of a download link's token. */
export function downloadUrl(publicUrl: string, token: string): string {
  return `${publicUrl}/api/downloads/${encodeURIComponent(token)}`;
}
