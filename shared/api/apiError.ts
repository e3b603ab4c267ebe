/** One problem of an invalid plan, with the path of its field. */
export interface ApiIssue { path: string; message: string }

/**
 * An API error as the server reports it (`{ error: { code, message, field?, issues? } }`) with its
 * HTTP status, 0 when no answer came at all. Shared by the CLI's client and the web app.
 */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly field?: string,
    readonly issues: ApiIssue[] = [],
  ) {
    super(message);
    this.name = 'ApiError';
  }
}
