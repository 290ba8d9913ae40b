/** The one error type services throw; the error middleware turns it into problem+json. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
  }

  static badRequest(message: string, extra?: Record<string, unknown>) { return new AppError(400, 'bad-request', message, extra); }
  static unauthorized(message = 'Sign in first') { return new AppError(401, 'unauthorized', message); }
  static forbidden(message = 'Your role does not allow this') { return new AppError(403, 'forbidden', message); }
  static notFound(what = 'Resource') { return new AppError(404, 'not-found', `${what} not found`); }
  static conflict(message: string) { return new AppError(409, 'conflict', message); }
}
