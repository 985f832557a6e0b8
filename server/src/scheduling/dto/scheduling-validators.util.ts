import { registerDecorator, type ValidationArguments, type ValidationOptions } from 'class-validator';
import { isIanaZone, isWallClock, rruleProblem } from '../resource-rules.util.js';

function rule(name: string, test: (v: unknown) => boolean, message: (args: ValidationArguments) => string, options?: ValidationOptions) {
  return (object: object, propertyName: string) =>
    registerDecorator({ name, target: object.constructor, propertyName, options, validator: { validate: test, defaultMessage: message } });
}

/** An IANA time-zone name luxon knows (e.g. America/New_York). */
export const IsIanaZone = (o?: ValidationOptions) =>
  rule('isIanaZone', (v) => typeof v === 'string' && isIanaZone(v), (a) => `${a.property} must be an IANA time zone such as America/New_York`, o);

/** 'HH:mm' local wall-clock time, 00:00–24:00. */
export const IsWallClock = (o?: ValidationOptions) =>
  rule('isWallClock', (v) => typeof v === 'string' && isWallClock(v), (a) => `${a.property} must be a time HH:mm`, o);

/** An RFC 5545 RRULE value the rrule library reads and that yields dates. */
export const IsRrule = (o?: ValidationOptions) =>
  rule('isRrule', (v) => typeof v === 'string' && rruleProblem(v) === null, (a) => `${a.property}: ${typeof a.value === 'string' ? rruleProblem(a.value) : 'must be text'}`, o);
