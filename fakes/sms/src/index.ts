// What tests and benches import as `@ostium/sms-fake`.
export { signTwilioRequest, signaturePayload, signatureMatches, type SignedParams } from './signature.js';
export { countSegments, type SegmentCount } from './segments.js';
export {
  startSmsFake,
  twimlMessages,
  FakeInputError,
  WebhookUnreachableError,
  API_VERSION,
  DEFAULT_ACCOUNT_SID,
  DEFAULT_AUTH_TOKEN,
  DEFAULT_OUR_NUMBER,
  FAULT_MODES,
  type ActiveFault,
  type CallbackResult,
  type FailingOutcome,
  type FakeMessage,
  type FakeStats,
  type FaultMode,
  type FaultSpec,
  type MessageDirection,
  type MessageStatus,
  type ReplyRequest,
  type ReplyResult,
  type SmsFake,
  type SmsFakeOptions,
  type StatusStep,
  type WebhookResult,
} from './sms-fake.js';
