// Pure reminder rules: encoding and length, quiet hours, caps, reply keywords, templates.
export * from './sms-encoding.util.js';
export * from './quiet-hours.util.js';
export * from './caps.util.js';
export * from './keywords.util.js';
export * from './templates.util.js';
