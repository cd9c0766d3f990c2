import {
  emptyUploads,
  itemPercent,
  reduceUploads,
  uploadBatch,
  type UploadAction,
  type UploadState,
} from './upload-state';

const picked: UploadAction = {
  type: 'picked',
  files: [
    { key: 1, fileName: 'frame-01.tif', size: 1000 },
    { key: 2, fileName: 'notes.tif', size: 200 },
    { key: 3, fileName: 'frame-02.tif', size: 800 },
  ],
};

const run = (...actions: UploadAction[]): UploadState => actions.reduce(reduceUploads, emptyUploads);

describe('reduceUploads', () => {
  it('queues picked files with nothing sent', () => {
    const state = run(picked);
    expect(state.items.map((i) => [i.key, i.state, i.sentBytes])).toEqual([
      [1, 'queued', 0],
      [2, 'queued', 0],
      [3, 'queued', 0],
    ]);
    expect(uploadBatch(state)).toMatchObject({ files: 3, finished: 0, percent: 0, busy: true });
  });

  it('moves the bar of the file its request carries and no other', () => {
    const state = run(
      picked,
      { type: 'started', keys: [1] },
      // the body is the file plus multipart framing: 1100 bytes, half of it sent
      { type: 'progress', keys: [1], loaded: 550, total: 1100 },
    );
    expect(state.items[0]).toMatchObject({ state: 'sending', sentBytes: 500 });
    expect(itemPercent(state.items[0]!)).toBe(50);
    expect(state.items.slice(1).map((i) => i.state)).toEqual(['queued', 'queued']);
    expect(uploadBatch(state)).toMatchObject({ sentBytes: 500, totalBytes: 2000, percent: 25 });
  });

  it('spreads one request’s progress over its files in the order they are sent', () => {
    const state = run(picked, { type: 'progress', keys: [1, 2, 3], loaded: 1100, total: 2000 });
    expect(state.items.map((i) => i.sentBytes)).toEqual([1000, 100, 0]);
  });

  it('puts each verdict of a many-file answer on the file it names', () => {
    const state = run(picked, {
      type: 'answered',
      keys: [1, 2, 3],
      result: {
        accepted: [
          { fileName: 'frame-02.tif', frameId: 12, index: 2, duplicate: false, warnings: [] },
          { fileName: 'frame-01.tif', frameId: 11, index: 1, duplicate: false, warnings: ['No ICC profile'] },
        ],
        rejected: [
          { fileName: 'notes.tif', code: 'not-an-image', reason: 'The file is not a TIFF or PNG image.' },
        ],
      },
    });
    expect(state.items.map((i) => [i.fileName, i.state, i.frameIndex, i.reason])).toEqual([
      ['frame-01.tif', 'accepted', 1, null],
      ['notes.tif', 'rejected', null, 'The file is not a TIFF or PNG image.'],
      ['frame-02.tif', 'accepted', 2, null],
    ]);
    expect(state.items[0]!.warnings).toEqual(['No ICC profile']);
    expect(uploadBatch(state)).toMatchObject({
      finished: 3,
      accepted: 2,
      rejected: 1,
      percent: 100,
      busy: false,
    });
  });

  it('gives two files of one name a verdict each, in order', () => {
    const state = run(
      {
        type: 'picked',
        files: [
          { key: 1, fileName: 'scan.tif', size: 10 },
          { key: 2, fileName: 'scan.tif', size: 10 },
        ],
      },
      {
        type: 'answered',
        keys: [1, 2],
        result: {
          accepted: [{ fileName: 'scan.tif', frameId: 5, index: 1, duplicate: false, warnings: [] }],
          rejected: [
            { fileName: 'scan.tif', code: 'duplicate-scan', reason: 'The same scan is already frame 1.' },
          ],
        },
      },
    );
    expect(state.items.map((i) => i.state)).toEqual(['accepted', 'rejected']);
    expect(state.items[1]!.reason).toBe('The same scan is already frame 1.');
  });

  it('takes the reason of a refused request from the problem’s entry for that file, without its name', () => {
    const state = run(picked, {
      type: 'failed',
      keys: [2],
      message: 'None of the 1 files was kept: notes.tif: The file is not a TIFF or PNG image.',
      fileReasons: { 'files.notes.tif': 'notes.tif: The file is not a TIFF or PNG image.' },
    });
    expect(state.items[1]).toMatchObject({
      state: 'rejected',
      reason: 'The file is not a TIFF or PNG image.',
    });
    expect(state.items[0]!.state).toBe('queued');
  });

  it('gives every file of a request refused as a whole the problem’s sentence', () => {
    const state = run(picked, {
      type: 'failed',
      keys: [1, 3],
      message: 'At most 2 files per upload; nothing was kept.',
      fileReasons: {},
    });
    expect([state.items[0]!.reason, state.items[2]!.reason]).toEqual([
      'At most 2 files per upload; nothing was kept.',
      'At most 2 files per upload; nothing was kept.',
    ]);
  });

  it('ignores late progress of a file already answered', () => {
    const answered = run(picked, {
      type: 'failed',
      keys: [1],
      message: 'Refused',
      fileReasons: {},
    });
    const state = reduceUploads(answered, { type: 'progress', keys: [1], loaded: 10, total: 1100 });
    expect(state.items[0]).toMatchObject({ state: 'rejected', sentBytes: 1000 });
  });
});
