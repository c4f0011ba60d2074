export { parseSweepFile } from './parse-sweep-file';
export { SweepFileError, isSweepFileError, describeLocation } from './errors';
export type { SweepFileErrorCode, SweepFileLocation } from './errors';
export {
  MAX_SWEEP_FILE_BYTES,
  MAX_SWEEP_POINTS_PER_FILE,
  MIN_CURVES_PER_PART,
  MIN_POINTS_PER_CURVE,
  SIGN_NOISE_FRACTION,
  MAX_FORWARD_VGS_V,
  VGS_STEP_RESOLUTION_V,
} from './limits';
export type {
  ParseSweepFileInput,
  ParsedSweepFile,
  ParsedSweepPart,
  SweepCurve,
  SweepMetadata,
  SweepFileFormat,
  SweepSignConvention,
  ChannelSource,
  SerialSource,
} from './types';
