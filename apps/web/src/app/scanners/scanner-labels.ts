import type { ScannerKind, ScannerProfile } from '@clearbase/contracts';

// Written out here rather than read from the contracts' zod enums, to keep zod out of the browser bundle.
const kindLabels: Record<ScannerKind, string> = {
  'camera-rig': 'Camera rig',
  'lab-scanner': 'Lab scanner',
  flatbed: 'Flatbed',
};

const encodingLabels: Record<ScannerProfile['encoding'], string> = {
  linear: 'Linear',
  srgb: 'sRGB curve',
  gamma: 'Pure gamma',
};

export const kindChoices = Object.keys(kindLabels) as readonly ScannerKind[];
export const encodingChoices = Object.keys(encodingLabels) as readonly ScannerProfile['encoding'][];

export function kindLabel(kind: ScannerKind): string {
  return kindLabels[kind];
}

/** "Linear", "sRGB curve", or "Pure gamma 2.2". */
export function encodingLabel(profile: Pick<ScannerProfile, 'encoding' | 'gamma'>): string {
  return profile.encoding === 'gamma'
    ? `${encodingLabels.gamma} ${profile.gamma}`
    : encodingLabels[profile.encoding];
}
