/**
 * A failure the user can act on: printed as one line, never with a stack trace.
 * exitCode 1 = the work could not be done, 2 = the command line was wrong.
 */
export class UserError extends Error {
  readonly exitCode: 1 | 2;
  constructor(message: string, exitCode: 1 | 2 = 1) {
    super(message);
    this.name = 'UserError';
    this.exitCode = exitCode;
  }
}

/** A usage error (exit 2). */
export function usageError(message: string): UserError {
  return new UserError(message, 2);
}
