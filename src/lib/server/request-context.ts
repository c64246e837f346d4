import { AsyncLocalStorage } from 'node:async_hooks';

/** Facts about the current request that code deep in a call (the sign-in check) needs but cannot be handed. */
export interface RequestContext {
  clientAddress: string;
}

export const requestContext = new AsyncLocalStorage<RequestContext>();

export function currentClientAddress(): string {
  return requestContext.getStore()?.clientAddress ?? 'unknown';
}
