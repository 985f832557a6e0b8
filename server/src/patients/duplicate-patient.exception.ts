import { ArgumentsHost, Catch, ConflictException, ExceptionFilter } from '@nestjs/common';
import type { DuplicatePatientBody, Patient } from '@ostium/shared';
import type { Response } from 'express';

/** A patient with the same name and date of birth exists; the caller may repeat with `confirmNew: true`. */
export class DuplicatePatientException extends ConflictException {
  constructor(readonly existing: Patient[]) {
    super(
      `A patient named ${existing[0]!.firstName} ${existing[0]!.lastName} born ${existing[0]!.dateOfBirth} already exists; ` +
        'use the existing record, or send confirmNew: true to add a new one',
    );
  }
}

/** Answers with `DuplicatePatientBody` (the global filter keeps only message and errors). */
@Catch(DuplicatePatientException)
export class DuplicatePatientFilter implements ExceptionFilter {
  catch(exception: DuplicatePatientException, host: ArgumentsHost) {
    const res = host.switchToHttp().getResponse<Response>();
    const body: DuplicatePatientBody = { statusCode: 409, message: exception.message, existing: exception.existing };
    res.status(409).json(body);
  }
}
