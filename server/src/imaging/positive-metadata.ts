/** What a finished positive records about how it was made. */
export interface PositiveMetadata {
  /** Stock name, e.g. "Larkspur 200". */
  stock?: string;
  /** Stock profile and version the frame was rendered with, e.g. "larkspur-200@3". */
  profileVersion?: string;
  /** Scanner profile used to linearise the counts. */
  scanner?: string;
  /** Roll and frame adjustments (printer points, exposure, contrast...), stored as JSON. */
  adjustments?: Record<string, unknown>;
  /** Name of the negative the positive came from. */
  sourceFile?: string;
}

// Our own XMP namespace; XMP itself is ISO 16684-1, the RDF wrapper is its section 7.
export const XMP_NAMESPACE = 'urn:x-clearbase:positive:1.0/';

const FIELDS = ['stock', 'profileVersion', 'scanner', 'sourceFile'] as const;

/** A one-line summary for EXIF ImageDescription and dc:description. */
export function describePositive(meta: PositiveMetadata): string {
  const parts = [
    meta.stock && `stock ${meta.stock}`,
    meta.profileVersion && `profile ${meta.profileVersion}`,
    meta.scanner && `scanner ${meta.scanner}`,
    meta.adjustments && `adjustments ${JSON.stringify(meta.adjustments)}`,
  ].filter(Boolean);
  return `Clearbase positive${parts.length ? `: ${parts.join('; ')}` : ''}`;
}

/** Serialises the metadata as an XMP packet with one attribute per field. */
export function positiveXmp(meta: PositiveMetadata): string {
  const attrs = FIELDS.filter((k) => meta[k] !== undefined).map(
    (k) => ` cb:${k}="${escapeXml(String(meta[k]))}"`,
  );
  if (meta.adjustments) attrs.push(` cb:adjustments="${escapeXml(JSON.stringify(meta.adjustments))}"`);
  return (
    '<?xpacket begin="\uFEFF" id="W5M0MpCehiHzreSzNTczkc9d"?>' +
    '<x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">' +
    `<rdf:Description rdf:about="" xmlns:dc="http://purl.org/dc/elements/1.1/" xmlns:cb="${XMP_NAMESPACE}" cb:colourSpace="sRGB"${attrs.join('')}>` +
    `<dc:description><rdf:Alt><rdf:li xml:lang="x-default">${escapeXml(describePositive(meta))}</rdf:li></rdf:Alt></dc:description>` +
    '</rdf:Description></rdf:RDF></x:xmpmeta><?xpacket end="w"?>'
  );
}

/** Reads back what `positiveXmp` wrote; fields absent from the packet stay undefined. */
export function parsePositiveXmp(xmp: string): PositiveMetadata {
  const attr = (name: string) => {
    const m = new RegExp(`cb:${name}="([^"]*)"`).exec(xmp);
    return m ? unescapeXml(m[1] ?? '') : undefined;
  };
  const out: PositiveMetadata = {};
  for (const k of FIELDS) {
    const v = attr(k);
    if (v !== undefined) out[k] = v;
  }
  const adjustments = attr('adjustments');
  if (adjustments !== undefined) out.adjustments = JSON.parse(adjustments) as Record<string, unknown>;
  return out;
}

function escapeXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function unescapeXml(s: string): string {
  return s
    .replace(/&quot;/g, '"')
    .replace(/&gt;/g, '>')
    .replace(/&lt;/g, '<')
    .replace(/&amp;/g, '&');
}
