/**
 * Below this confidence a detected film base is not trusted: a frame falls back to its roll's base, the command line
 * warns. Our choice, from memory of scans: detection's confidence grows with the even blocks of film it found (full at
 * eight), so below 0.3 it rests on fewer than about three blocks, too little to trust over the roll.
 */
export const MIN_BASE_CONFIDENCE = 0.3;
