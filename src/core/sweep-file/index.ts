export { parseSweepFile } from './parse-sweep-file';
export { decodeSweepBytes, describeNonText, nonTextError } from './decode-sweep-bytes';
export { escapeForMessage, quoteForMessage, capLength, MAX_MESSAGE_LENGTH } from './quote-for-message';
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
  MAX_HEADER_CELLS,
  MAX_GATE_STEP_COLUMNS,
  MAX_ABS_ID_A,
  MAX_ABS_VDS_V,
  MAX_ABS_VGS_V,
  MIN_PEAK_ID_A,
  MIN_TEMPERATURE_C,
  MAX_TEMPERATURE_C,
  MIN_POINTS_PER_TRANSFER_CURVE,
} from './limits';
export type {
  ParseSweepFileInput,
  ParsedSweepFile,
  ParsedSweepPart,
  SweepCurve,
  SweepKind,
  SweepNote,
  TransferCurve,
  SweepMetadata,
  SweepFileFormat,
  SweepSignConvention,
  ChannelSource,
  SerialSource,
} from './types';
