/**
 * Typed errors: every failure names the file (or item), the field and the problem, so the user can
 * find it. Readers throw BorewaveError; callers that must keep going turn it into an ErrorInfo.
 */
/**
 * Every stable machine code the program gives (one list: readers, project opener, pipeline, worker).
 * Reader codes for instrument files and hostile input (docs/seg2-vendor-keywords.md,
 * docs/text-waveforms.md): SEG2_NO_TRACES, SEG2_IMPLAUSIBLE_VALUE (value outside its plausible range),
 * SEG2_BAD_CHANNEL, SEG2_DUPLICATE_CHANNEL, SEG2_TRIGGER_CONFLICT; TEXT_NO_DATA, TEXT_NO_SAMPLE_INTERVAL,
 * TEXT_BAD_SAMPLE_INTERVAL, and the limits TEXT_LINE_TOO_LONG, TEXT_TOO_MANY_COLUMNS,
 * TEXT_TOO_MANY_CELLS, TEXT_TOO_LARGE (checked before allocating). Warnings (the file still reads,
 * WaveRecord.warnings): SEG2_REVISION, TEXT_PREAMBLE_SKIPPED, TEXT_TIME_UNIT_GUESSED,
 * TEXT_SAMPLE_INTERVAL_DIFFERS. Message: FILE_SAME_NAME (a file kept under a distinct name).
 */
export type ErrorCode =
  | 'ARCHIVE_BAD_ENTRY_NAME'
  | 'ARCHIVE_CORRUPT'
  | 'ARCHIVE_DUPLICATE_FILE'
  | 'ARCHIVE_ENTRY_TOO_LARGE'
  | 'ARCHIVE_FILE_UNLISTED'
  | 'ARCHIVE_NOT_ZIP'
  | 'ARCHIVE_NO_PROJECT'
  | 'ARCHIVE_TOO_LARGE'
  | 'ARCHIVE_TOO_MANY_ENTRIES'
  | 'AUTOSAVE_READ'
  | 'CANCELLED'
  | 'COMPARISON_COLUMNS'
  | 'COMPARISON_DEPTH_REPEATED'
  | 'COMPARISON_EMPTY'
  | 'COMPARISON_ROW'
  | 'CURVE_INPUT'
  | 'DELAY_BAND'
  | 'DELAY_BOUNDS'
  | 'DELAY_EMPTY'
  | 'DELAY_NO_SIGNAL'
  | 'DESIGN_CYCLES'
  | 'DESIGN_FREQUENCY'
  | 'DESIGN_SHAKING'
  | 'DEVIATION_BAD'
  | 'DEVIATION_EMPTY'
  | 'DEVIATION_IMPOSSIBLE'
  | 'DEVIATION_NEGATIVE_DEPTH'
  | 'DEVIATION_NOT_INCREASING'
  | 'DEVIATION_NOT_MONOTONIC'
  | 'DEVIATION_NOT_NUMERIC'
  | 'DEVIATION_RAGGED_ROW'
  | 'DEVIATION_TOO_FEW_COLUMNS'
  | 'FFT_SIZE'
  | 'FILE_EMPTY'
  | 'FILE_NOT_READABLE'
  | 'FILE_SAME_NAME'
  | 'FILTER_CORNERS'
  | 'FILTER_ORDER'
  | 'FILTER_RATE'
  | 'FILTER_SOS'
  | 'INTERNAL'
  | 'CHANNEL_DUPLICATE'
  | 'LOG_AMBIGUOUS_FILE'
  | 'LOG_COMPONENTS_COUNT'
  | 'LOG_FILE_NOT_LISTED'
  | 'LOG_UNKNOWN_FILE'
  | 'RECORD_LOG'
  | 'LIQ_DEPTH'
  | 'LIQ_MAGNITUDE'
  | 'LIQ_NO_LAYERS'
  | 'LIQ_NO_WATER_TABLE'
  | 'LIQ_PGA'
  | 'MC_DRAWS'
  | 'ORIENTATION_FAILED'
  | 'MC_NO_INTERVALS'
  | 'METHOD_DRIFT'
  | 'PAIR_BOUNDS'
  | 'PAIR_MISSING_STATION'
  | 'PAIR_SAMPLE_INTERVAL'
  | 'PICK_DUPLICATE_STATION'
  | 'PICK_MIN_FRACTION'
  | 'PICK_ONSET_INDEX'
  | 'PICK_STALTA_SETTINGS'
  | 'PICK_TRACE'
  | 'PICK_WINDOW'
  | 'PROJECT_BAD_FIELD'
  | 'PROJECT_BAD_JSON'
  | 'PROJECT_FILE_MISSING'
  | 'RAYLEIGH_POISSON'
  | 'RECORD_MISSING'
  | 'RECORD_NO_CHANNEL'
  | 'RECORD_NO_DEPTH'
  | 'SEG2_ABSURD_SAMPLE_COUNT'
  | 'SEG2_BAD_BLOCK_ID'
  | 'SEG2_BAD_CHANNEL'
  | 'SEG2_BAD_DATA_SIZE'
  | 'SEG2_BAD_FORMAT_CODE'
  | 'SEG2_BAD_KEYWORD_VALUE'
  | 'SEG2_BAD_POINTER_BLOCK'
  | 'SEG2_BAD_SAMPLE_COUNT'
  | 'SEG2_BAD_SAMPLE_INTERVAL'
  | 'SEG2_BAD_STRING'
  | 'SEG2_BAD_TERMINATOR'
  | 'SEG2_DUPLICATE_CHANNEL'
  | 'SEG2_EMPTY_FILE'
  | 'SEG2_IMPLAUSIBLE_VALUE'
  | 'SEG2_NONFINITE_SAMPLE'
  | 'SEG2_NO_TRACES'
  | 'SEG2_POINTER_PAST_END'
  | 'SEG2_REVISION'
  | 'SEG2_STRING_TOO_LONG'
  | 'SEG2_TOO_MANY_TRACES'
  | 'SEG2_TRIGGER_CONFLICT'
  | 'SEG2_TRUNCATED'
  | 'SIGNAL_LENGTH_MISMATCH'
  | 'SIGNAL_SAMPLE_INTERVAL'
  | 'SIGNAL_TOO_SHORT'
  | 'SITE_VS30'
  | 'SOIL_GAP'
  | 'SOIL_NO_LAYERS'
  | 'SOIL_OVERLAP'
  | 'SOIL_POISSON'
  | 'SOIL_STRESS_EXPONENT'
  | 'SOIL_THICKNESS'
  | 'SOIL_UNIT_WEIGHT'
  | 'SOIL_WATER_TABLE'
  | 'SOIL_WATER_UNIT_WEIGHT'
  | 'STACK_EMPTY'
  | 'STATION_BAD_SAMPLE_INTERVAL'
  | 'STATION_EXCLUDED'
  | 'STATION_MIXED_SAMPLING'
  | 'STATION_ZERO_DISTANCE'
  | 'STIFFNESS_INPUT'
  | 'STIFFNESS_INTERVAL'
  | 'STRESS_DEPTH'
  | 'SURVEY_UNKNOWN_HOLE'
  | 'LAYER_MODEL_NOT_MADE'
  | 'SYNTH_BAD_GEOMETRY'
  | 'SYNTH_BAD_MODEL'
  | 'SYNTH_BAD_OPTION'
  | 'TAPER_FRACTION'
  | 'TEXT_BAD_SAMPLE_INTERVAL'
  | 'TEXT_EMPTY'
  | 'TEXT_IRREGULAR_TIME'
  | 'TEXT_LINE_TOO_LONG'
  | 'TEXT_NOT_NUMERIC'
  | 'TEXT_NO_DATA'
  | 'TEXT_NO_SAMPLE_INTERVAL'
  | 'TEXT_PREAMBLE_SKIPPED'
  | 'TEXT_RAGGED_ROW'
  | 'TEXT_SAMPLE_INTERVAL_DIFFERS'
  | 'TEXT_TIME_UNIT_GUESSED'
  | 'TEXT_TOO_FEW_COLUMNS'
  | 'TEXT_TOO_FEW_ROWS'
  | 'TEXT_TOO_LARGE'
  | 'TEXT_TOO_MANY_CELLS'
  | 'TEXT_TOO_MANY_COLUMNS'
  | 'UNKNOWN_FORMAT'
  | 'VS1_PA'
  | 'VS1_STRESS'
  | 'VSZ_DEPTH'
  | 'VSZ_VELOCITY'
  | 'WORKER_FAILED';

export interface ErrorInfo {
  /** Stable machine code, e.g. SEG2_POINTER_PAST_END, TEXT_RAGGED_ROW. */
  code: ErrorCode;
  /** One sentence for a person: what is wrong and where. */
  message: string;
  /** File name or item (record id, borehole id) the problem is in. */
  file?: string;
  /** Field, keyword, column or byte offset concerned. */
  field?: string;
}

export class BorewaveError extends Error {
  readonly code: ErrorCode;
  readonly file?: string;
  readonly field?: string;
  constructor(code: ErrorCode, message: string, file?: string, field?: string) {
    super(message);
    this.name = 'BorewaveError';
    this.code = code;
    this.file = file;
    this.field = field;
  }
  toInfo(): ErrorInfo {
    return { code: this.code, message: this.message, file: this.file, field: this.field };
  }
}

/** Any thrown value as an ErrorInfo (unexpected exceptions become INTERNAL with their message). */
export function toErrorInfo(e: unknown, file?: string): ErrorInfo {
  if (e instanceof BorewaveError) return e.toInfo();
  const message = e instanceof Error ? e.message : String(e);
  return { code: 'INTERNAL', message: `Unexpected problem: ${message}`, file };
}
