/**
 * The one error type services throw. The central handler turns it into
 * `{ error: { code, message, details } }` with `status`; codes are part of the API contract.
 */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const notFound = (what: string) => new AppError(404, 'not-found', `${what} was not found`);
