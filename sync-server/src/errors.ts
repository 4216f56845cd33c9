/** The one error type the API raises on purpose; the error middleware turns it into JSON. */
export class AppError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly httpStatus: number,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const unauthenticated = (message = 'Sign in to continue.') =>
  new AppError('unauthenticated', message, 401);
export const forbidden = () => new AppError('forbidden', 'Your role does not allow this.', 403);
