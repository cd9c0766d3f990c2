import { describe, expect, it } from 'vitest';
import { frameReviewRequestSchema } from './tuning';

describe('frame review', () => {
  it('asks a rejection to say why, at the note', () => {
    const res = frameReviewRequestSchema.safeParse({ decision: 'rejected', note: '  ' });
    expect(res.success).toBe(false);
    expect(res.error?.issues[0]?.path).toEqual(['note']);
    expect(frameReviewRequestSchema.parse({ decision: 'approved' })).toEqual({
      decision: 'approved',
      note: '',
    });
  });
});
