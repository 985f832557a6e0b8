import { parsePhone, PhoneNumberError } from '@ostium/shared';
import { registerDecorator, type ValidationArguments, type ValidationOptions } from 'class-validator';
import { DateTime, IANAZone } from 'luxon';

/** Trims strings; an empty string becomes null so "cleared" fields store as null. */
export const trimToNull = ({ value }: { value: unknown }) => {
  if (typeof value !== 'string') return value;
  const t = value.trim();
  return t === '' ? null : t;
};
export const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);
export const lowerToNull = ({ value }: { value: unknown }) => {
  const v = trimToNull({ value });
  return typeof v === 'string' ? v.toLowerCase() : v;
};

function phoneProblem(value: unknown): string | null {
  if (value === null || value === undefined) return null;
  if (typeof value !== 'string') return 'must be text';
  try {
    parsePhone(value, 'US');
    return null;
  } catch (e) {
    if (e instanceof PhoneNumberError) return e.message;
    throw e;
  }
}

/** Any phone input libphonenumber-js reads as a valid number (US national or +international); null allowed. */
export function IsPhone(options?: ValidationOptions) {
  return (object: object, propertyName: string) =>
    registerDecorator({
      name: 'isPhone',
      target: object.constructor,
      propertyName,
      options,
      validator: {
        validate: (value: unknown) => phoneProblem(value) === null,
        defaultMessage: (args: ValidationArguments) => `${args.property}: ${phoneProblem(args.value)}`,
      },
    });
}

/** Storage form of an already validated phone field. */
export const toE164 = (value: string | null | undefined): string | null => (value ? parsePhone(value, 'US').e164 : null);

const DATE = /^\d{4}-\d{2}-\d{2}$/;

function dateProblem(value: unknown, notFuture: boolean, earliest?: string): string | null {
  if (typeof value !== 'string' || !DATE.test(value)) return 'must be a date written YYYY-MM-DD';
  const d = DateTime.fromISO(value, { zone: 'utc' });
  if (!d.isValid) return `${value} is not a calendar date`;
  if (earliest && value < earliest) return `must be on or after ${earliest}`;
  // A day of slack: "today" differs across the practice's time zones.
  if (notFuture && value > DateTime.utc().plus({ days: 1 }).toISODate()!) return 'cannot be in the future';
  return null;
}

/** A real calendar date YYYY-MM-DD, optionally not in the future and not before `earliest`. */
export function IsCalendarDate(opts: { notFuture?: boolean; earliest?: string } = {}, options?: ValidationOptions) {
  return (object: object, propertyName: string) =>
    registerDecorator({
      name: 'isCalendarDate',
      target: object.constructor,
      propertyName,
      options,
      validator: {
        validate: (value: unknown) => dateProblem(value, !!opts.notFuture, opts.earliest) === null,
        defaultMessage: (args: ValidationArguments) => `${args.property} ${dateProblem(args.value, !!opts.notFuture, opts.earliest)}`,
      },
    });
}

/** An IANA time zone name known to the runtime's time zone database; null allowed. */
export function IsTimeZone(options?: ValidationOptions) {
  return (object: object, propertyName: string) =>
    registerDecorator({
      name: 'isTimeZone',
      target: object.constructor,
      propertyName,
      options,
      validator: {
        validate: (value: unknown) => value === null || value === undefined || (typeof value === 'string' && IANAZone.isValidZone(value)),
        defaultMessage: (args: ValidationArguments) => `${args.property} must be an IANA time zone such as America/New_York`,
      },
    });
}
