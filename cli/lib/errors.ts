// Exit codes of every weir command (site-format.md, "Errors and exit codes"):
// 0 nothing wrong, 1 the content has errors or was refused, 2 usage, I/O or set-up trouble.
export const EXIT_OK = 0;
export const EXIT_FINDINGS = 1;
export const EXIT_USAGE = 2;

/** A problem the user can fix; printed as one line (plus an optional hint), never a stack trace. */
export class CliError extends Error {
  readonly exitCode: number;
  readonly hint?: string;
  constructor(message: string, exitCode: number = EXIT_USAGE, hint?: string) {
    super(message);
    this.name = 'CliError';
    this.exitCode = exitCode;
    this.hint = hint;
  }
}

/** The error body of the API contract: `{ error: { code, message, details? } }`. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: unknown;
  constructor(status: number, code: string, message: string, details?: unknown) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.code = code;
    this.details = details;
  }
}

/** Text of an unknown thrown value, without its stack. */
export function messageOf(err: unknown): string {
  if (err instanceof Error) return err.message;
  return String(err);
}
