/** Longest e-mail address: 254 characters, the forward path limit of RFC 5321 §4.5.3.1.3 less its angle brackets. */
export const emailMaxLength = 254;
/** Longest person's, stock's or maker's name (our choice). */
export const nameMaxLength = 120;
/** Password length: at least 10 (NIST SP 800-63B asks at least 8; ours is stricter), at most 200 (our choice). */
export const passwordLength = { min: 10, max: 200 } as const;
/** Longest free-text note on an order or a stock: a few paragraphs (our choice). */
export const notesMaxLength = 4000;
/** Longest one-line note: a changelog line, an operator's note on a frame (our choice). */
export const lineNoteMaxLength = 500;
/** Longest frame format name, e.g. "120-6x7" (our choice). */
export const frameFormatMaxLength = 40;
