import type { ProfileVersionSummary, Stock, StockDetail } from '@clearbase/contracts';

/** Invented stocks for the catalogue's component tests. */
export const testStocks: Stock[] = [
  {
    id: 1,
    name: 'Glasswing 400',
    maker: 'Harrowgate Emulsions',
    iso: 400,
    process: 'C-41',
    masked: false,
    baseMaterial: 'tinted polyester',
    frameFormats: ['135-36'],
    notes: 'Unmasked on a thin base.',
    recommendedEi: 400,
    latitudeUnderStops: 1,
    latitudeOverStops: 3,
    pushPullNotes: 'One stop of push.',
    reciprocityExponent: 1.3,
    handlingNotes: 'Load by hand.',
    createdAt: '2026-11-01T09:00:00.000Z',
  },
  {
    id: 2,
    name: 'Kestrel Colour 160',
    maker: 'Corvel Film Works',
    iso: 160,
    process: 'C-41',
    masked: true,
    baseMaterial: 'acetate',
    frameFormats: ['120'],
    notes: '',
    recommendedEi: null,
    latitudeUnderStops: null,
    latitudeOverStops: null,
    pushPullNotes: '',
    reciprocityExponent: 1.3,
    handlingNotes: '',
    createdAt: '2026-11-01T09:00:00.000Z',
  },
  {
    id: 3,
    name: 'Bramble Mono 100',
    maker: 'Corvel Film Works',
    iso: 100,
    process: 'black-and-white',
    masked: false,
    baseMaterial: 'clear polyester',
    frameFormats: ['135-36', '120'],
    notes: '',
    recommendedEi: 80,
    latitudeUnderStops: 2,
    latitudeOverStops: 2,
    pushPullNotes: '',
    reciprocityExponent: 1.45,
    handlingNotes: '',
    createdAt: '2026-11-01T09:00:00.000Z',
  },
];

const version = (
  over: Partial<ProfileVersionSummary> & Pick<ProfileVersionSummary, 'id' | 'version' | 'status'>,
) =>
  ({
    profileId: 10,
    parentVersionId: null,
    changelog: null,
    createdAt: '2026-11-02T10:00:00.000Z',
    createdBy: 2,
    createdByName: 'Ola Brandt',
    updatedAt: '2026-11-02T10:00:00.000Z',
    publishedAt: null,
    publishedBy: null,
    publishedByName: null,
    retiredAt: null,
    ...over,
  }) satisfies ProfileVersionSummary;

/** Glasswing's page: one profile with a retired, a published and a draft version. */
export const testDetail: StockDetail = {
  stock: testStocks[0]!,
  profiles: [
    {
      id: 10,
      stockId: 1,
      scannerId: null,
      name: 'Glasswing, house profile',
      documentId: 'demo-glasswing-400',
      createdAt: '2026-11-02T10:00:00.000Z',
      versions: [
        version({
          id: 100,
          version: 1,
          status: 'retired',
          changelog: 'First release',
          publishedAt: '2026-11-03T10:00:00.000Z',
          retiredAt: '2026-11-05T10:00:00.000Z',
        }),
        version({
          id: 101,
          version: 2,
          status: 'published',
          parentVersionId: 100,
          changelog: 'Warmer shadows',
          publishedAt: '2026-11-04T10:00:00.000Z',
          publishedBy: 1,
          publishedByName: 'Ines Varga',
        }),
        version({ id: 102, version: 3, status: 'draft', parentVersionId: 101 }),
      ],
    },
  ],
};
