export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export class ValidationError extends AppError {
  constructor(message: string, details?: unknown) {
    super(400, 'invalid_input', message, details);
  }
}
export class UnauthorizedError extends AppError {
  constructor(message = 'Sign in to do this.') {
    super(401, 'unauthorized', message);
  }
}
export class ForbiddenError extends AppError {
  constructor(message = 'Your roles do not allow this.') {
    super(403, 'forbidden', message);
  }
}
export class NotFoundError extends AppError {
  constructor(message = 'Not found.') {
    super(404, 'not_found', message);
  }
}
export class ConflictError extends AppError {
  constructor(message: string, details?: unknown) {
    super(409, 'conflict', message, details);
  }
}
export class UnprocessableError extends AppError {
  constructor(message: string, details?: unknown) {
    super(422, 'unprocessable', message, details);
  }
}
