import { AsyncLocalStorage } from 'node:async_hooks';
import type { Role } from '@ostium/shared';

export interface RequestUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  practiceId: number;
}

export interface RequestContext {
  requestId: string;
  user?: RequestUser;
}

// Lets the audit hooks know who made a change without threading the user through every call.
export const requestContext = new AsyncLocalStorage<RequestContext>();

export const currentContext = () => requestContext.getStore();
