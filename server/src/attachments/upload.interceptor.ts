import {
  BadRequestException,
  CallHandler,
  ExecutionContext,
  Injectable,
  NestInterceptor,
  PayloadTooLargeException,
} from '@nestjs/common';
import type { Request, Response } from 'express';
import multer from 'multer';
import { from, switchMap, type Observable } from 'rxjs';
import { MAX_UPLOAD_BYTES } from './file-check.util.js';

const MB = MAX_UPLOAD_BYTES / (1024 * 1024);

// Kept in memory (at most 20 MB) so the content is checked before anything touches the disk.
const single = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 10, fieldSize: 1024, parts: 12 },
  defParamCharset: 'utf8',
}).single('file');

/** Turns multer's errors into the API's error body, naming the field. */
export function uploadError(e: unknown): Error {
  if (e instanceof multer.MulterError) {
    switch (e.code) {
      case 'LIMIT_FILE_SIZE':
        return new PayloadTooLargeException({
          message: `The file is larger than the ${MB} MB limit per file; it was not stored`,
          errors: [{ field: 'file', message: `larger than ${MB} MB` }],
        });
      case 'LIMIT_UNEXPECTED_FILE':
      case 'LIMIT_FILE_COUNT':
        return new BadRequestException({
          message: 'Send one file per upload, in the form field named file',
          errors: [{ field: e.field ?? 'file', message: 'unexpected file' }],
        });
      default:
        return new BadRequestException({ message: `The upload was refused: ${e.message}`, errors: [{ field: e.field ?? 'file', message: e.message }] });
    }
  }
  return new BadRequestException({ message: 'The upload is not a readable multipart/form-data request', errors: [{ field: 'file', message: 'unreadable upload' }] });
}

@Injectable()
export class UploadInterceptor implements NestInterceptor {
  intercept(context: ExecutionContext, next: CallHandler): Observable<unknown> {
    const http = context.switchToHttp();
    const req = http.getRequest<Request>();
    const res = http.getResponse<Response>();
    const parsed = new Promise<void>((resolve, reject) => single(req, res, (err?: unknown) => (err ? reject(uploadError(err)) : resolve())));
    return from(parsed).pipe(switchMap(() => next.handle()));
  }
}
