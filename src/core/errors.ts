/**
 * Typed errors: every failure names the file (or item), the field and the problem, so the user can
 * find it. Readers throw BorewaveError; callers that must keep going turn it into an ErrorInfo.
 */
export interface ErrorInfo {
  /** Stable machine code, e.g. SEG2_POINTER_PAST_END, TEXT_RAGGED_ROW. */
  code: string;
  /** One sentence for a person: what is wrong and where. */
  message: string;
  /** File name or item (record id, borehole id) the problem is in. */
  file?: string;
  /** Field, keyword, column or byte offset concerned. */
  field?: string;
}

export class BorewaveError extends Error {
  readonly code: string;
  readonly file?: string;
  readonly field?: string;
  constructor(code: string, message: string, file?: string, field?: string) {
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
