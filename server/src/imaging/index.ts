export { ImageInputError, type ImageInputErrorCode } from './image-input-error';
export {
  readNegative,
  DEFAULT_MAX_PIXELS,
  type NegativeImage,
  type ReadNegativeOptions,
} from './read-negative';
export { readNegativeHeader, type NegativeHeader } from './read-negative-header';
export { sampleNegative, type NegativeSample } from './sample-negative';
export {
  writePositive,
  encodePositive,
  positivePipeline,
  POSITIVE_EXTENSIONS,
  DEFAULT_JPEG_QUALITY,
  type PositiveFormat,
  type EncodePositiveOptions,
  type WritePositiveOptions,
} from './write-positive';
export { readPositiveMetadata } from './read-positive-metadata';
export { type PositiveMetadata, positiveXmp, parsePositiveXmp, describePositive } from './positive-metadata';
export { sniffFormat, type SniffedFormat } from './sniff-format';
