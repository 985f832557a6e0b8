import { ArgumentsHost, Catch, ExceptionFilter, HttpException, HttpStatus, Logger } from '@nestjs/common';
import type { ApiErrorBody } from '@ostium/shared';
import type { Response } from 'express';
import { BaseError, ConnectionAcquireTimeoutError, ForeignKeyConstraintError, UniqueConstraintError, ValidationError as SqlValidationError } from 'sequelize';

/** Turns every error into `{statusCode, message, errors?}`; unknown errors become a 500 without internals. */
@Catch()
export class ApiExceptionFilter implements ExceptionFilter {
  private readonly logger = new Logger('Errors');

  catch(exception: unknown, host: ArgumentsHost) {
    const res = host.switchToHttp().getResponse<Response>();
    const body = this.toBody(exception);
    if (body.statusCode >= 500) this.logger.error(exception instanceof Error ? exception.stack : String(exception));
    if (res.headersSent) return;
    res.status(body.statusCode).json(body);
  }

  private toBody(exception: unknown): ApiErrorBody {
    if (exception instanceof HttpException && exception.cause instanceof SyntaxError && exception.getStatus() === 400) {
      // The body parser's own text would echo part of the body back.
      return { statusCode: 400, message: 'The request body is not valid JSON' };
    }
    if (exception instanceof HttpException) {
      const status = exception.getStatus();
      const r = exception.getResponse();
      if (typeof r === 'string') return { statusCode: status, message: r };
      const o = r as { message?: unknown; errors?: ApiErrorBody['errors']; conflicts?: unknown };
      const message = Array.isArray(o.message) ? o.message.join('; ') : String(o.message ?? exception.message);
      // A booking 409 names every colliding booking (BookingConflictBody).
      if (status === HttpStatus.CONFLICT && Array.isArray(o.conflicts)) return { statusCode: status, message, conflicts: o.conflicts } as ApiErrorBody;
      return o.errors ? { statusCode: status, message, errors: o.errors } : { statusCode: status, message };
    }
    if (exception instanceof UniqueConstraintError) {
      const errors = exception.errors.map((e) => ({ field: e.path ?? 'unknown', message: `${e.path} is already in use` }));
      return { statusCode: HttpStatus.CONFLICT, message: errors.map((e) => e.message).join('; ') || 'Already exists', errors };
    }
    if (exception instanceof ForeignKeyConstraintError) {
      const field = (exception.fields as string[] | undefined)?.[0] ?? 'reference';
      return { statusCode: HttpStatus.BAD_REQUEST, message: `${field} refers to a record that does not exist`, errors: [{ field, message: 'does not exist' }] };
    }
    if (exception instanceof SqlValidationError) {
      const errors = exception.errors.map((e) => ({ field: e.path ?? 'unknown', message: e.message }));
      return { statusCode: HttpStatus.BAD_REQUEST, message: errors.map((e) => `${e.field}: ${e.message}`).join('; '), errors };
    }
    if (exception instanceof ConnectionAcquireTimeoutError) {
      // Every database connection stayed busy for the whole wait: an overload, not a fault of the request.
      return { statusCode: HttpStatus.SERVICE_UNAVAILABLE, message: 'The server is busy right now; try again shortly' };
    }
    if (exception instanceof BaseError && /ECONNREFUSED|connect|pool/i.test(exception.message)) {
      return { statusCode: HttpStatus.SERVICE_UNAVAILABLE, message: 'The database is not reachable right now; try again shortly' };
    }
    const status = (exception as { status?: number; statusCode?: number })?.status ?? (exception as { statusCode?: number })?.statusCode;
    if (typeof status === 'number' && status >= 400 && status < 500) {
      return { statusCode: status, message: (exception as Error).message };
    }
    return { statusCode: HttpStatus.INTERNAL_SERVER_ERROR, message: 'Something went wrong on the server; it has been logged' };
  }
}
