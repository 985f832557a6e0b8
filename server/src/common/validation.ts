import { BadRequestException, ValidationError, ValidationPipe } from '@nestjs/common';

/** Flattens class-validator's tree into `{field: 'teeth.0.number', message}` rows. */
export function flattenValidationErrors(errors: ValidationError[], parent = ''): { field: string; message: string }[] {
  const out: { field: string; message: string }[] = [];
  for (const e of errors) {
    const field = parent ? `${parent}.${e.property}` : e.property;
    for (const [kind, msg] of Object.entries(e.constraints ?? {})) {
      out.push({ field, message: kind === 'whitelistValidation' ? `${field} is not a known field` : msg });
    }
    if (e.children?.length) out.push(...flattenValidationErrors(e.children, field));
  }
  return out;
}

export const validationPipe = () =>
  new ValidationPipe({
    whitelist: true,
    forbidNonWhitelisted: true,
    transform: true,
    exceptionFactory: (errors) => {
      const rows = flattenValidationErrors(errors);
      return new BadRequestException({ message: rows.map((r) => r.message).join('; '), errors: rows });
    },
  });
