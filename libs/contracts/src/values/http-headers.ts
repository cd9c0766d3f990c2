/** Angular's HttpClient reads this cookie and echoes it in the header below (Angular's XSRF convention). */
export const xsrfCookieName = 'XSRF-TOKEN';
export const xsrfHeaderName = 'X-XSRF-TOKEN';

/** Header names of a working negative's description; the body is raw little-endian 16-bit RGB. */
export const workingNegativeHeaders = {
  width: 'X-Negative-Width',
  height: 'X-Negative-Height',
  /** Film base the frame renders against, linear light 0..1, red,green,blue. */
  base: 'X-Film-Base',
  /** Where that base came from: frame, region or roll. */
  baseSource: 'X-Film-Base-Source',
  /** Full size of the scan, width×height, to map picked rectangles back. */
  scanSize: 'X-Scan-Size',
  /** The frame's levels measured on the full scan against that base, JSON: what the server's render uses. */
  levels: 'X-Frame-Levels',
} as const;

/** Header names of a profile version's reference negative; the body is the pixels alone. */
export const referenceNegativeHeaders = {
  width: 'X-Negative-Width',
  height: 'X-Negative-Height',
  /** Film base as linear light 0..1, three comma-separated numbers, red green blue. */
  base: 'X-Film-Base',
  /** The scanner encoding of the counts (always linear: black level 0, gains 1). */
  encoding: 'X-Scanner-Encoding',
} as const;

/** Header names of a calibration scan's JPEG preview: the size of the frame it shows. */
export const calibrationPreviewHeaders = {
  width: 'X-Frame-Width',
  height: 'X-Frame-Height',
} as const;
