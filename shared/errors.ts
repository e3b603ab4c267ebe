/**
 * Errors a user can cause, with a stable code, the HTTP status the API answers with, and the
 * field that caused it. Shared by the physics core, the server and the CLI so a message reads
 * the same everywhere.
 */
export class RollwayError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly status: number = 400,
    readonly field?: string,
  ) {
    super(message);
    this.name = 'RollwayError';
  }

  toJSON(): { code: string; message: string; field?: string } {
    return this.field === undefined
      ? { code: this.code, message: this.message }
      : { code: this.code, message: this.message, field: this.field };
  }
}

/** A user-supplied expression, table or option that cannot be used as given. */
export class InvalidInputError extends RollwayError {
  constructor(message: string, field?: string, code = 'invalid_input') {
    super(code, message, 400, field);
    this.name = 'InvalidInputError';
  }
}

/** The thing named does not exist (or is not visible to the caller, so ids do not leak). */
export class NotFoundError extends RollwayError {
  constructor(message: string) {
    super('not_found', message, 404);
    this.name = 'NotFoundError';
  }
}

/** The request is valid but the thing is in a state that does not allow it. */
export class ConflictError extends RollwayError {
  constructor(message: string, code = 'conflict') {
    super(code, message, 409);
    this.name = 'ConflictError';
  }
}

/** Not signed in, or the credential sent is bad, expired or revoked. */
export class UnauthorizedError extends RollwayError {
  constructor(message = 'sign in first (or send an API token as "Authorization: Bearer rwt_…")') {
    super('unauthorized', message, 401);
    this.name = 'UnauthorizedError';
  }
}

/** Signed in, but the role or token scope does not allow this. */
export class ForbiddenError extends RollwayError {
  constructor(message: string, code = 'forbidden') {
    super(code, message, 403);
    this.name = 'ForbiddenError';
  }
}
