/**
 * Below this confidence a detected film base is not trusted: a frame falls back to its roll's base, the command line
 * warns (common practice of the trade, from memory: about a third of the scan's base blocks agreeing).
 */
export const MIN_BASE_CONFIDENCE = 0.3;
