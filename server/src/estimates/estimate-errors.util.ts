import { BadRequestException } from '@nestjs/common';
import { ToothNumberError } from '@ostium/shared';
import { EstimateInputError } from './estimator/index.js';

/** Runs pure estimator code and turns its input errors into 400s that name the field. */
export function asBadRequest<T>(fn: () => T, toothField = 'tooth'): T {
  try {
    return fn();
  } catch (e) {
    if (e instanceof EstimateInputError) {
      throw new BadRequestException({ message: `${e.field}: ${e.message}`, errors: [{ field: e.field, message: e.message }] });
    }
    if (e instanceof ToothNumberError) {
      throw new BadRequestException({ message: e.message, errors: [{ field: toothField, message: e.message }] });
    }
    throw e;
  }
}
