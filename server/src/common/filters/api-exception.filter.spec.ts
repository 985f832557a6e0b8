import { ConnectionAcquireTimeoutError, ConnectionRefusedError } from 'sequelize';
import { describe, expect, it, vi } from 'vitest';
import { ApiExceptionFilter } from './api-exception.filter.js';

/** The filter's answer to one thrown error, through a stand-in for Express's response. */
function answer(e: unknown) {
  const res = { headersSent: false, status: vi.fn(), json: vi.fn() };
  res.status.mockReturnValue(res);
  const host = { switchToHttp: () => ({ getResponse: () => res }) };
  const filter = new ApiExceptionFilter();
  // Errors of 500 and up are logged; keep the test output quiet.
  vi.spyOn((filter as unknown as { logger: { error: () => void } }).logger, 'error').mockImplementation(() => undefined);
  filter.catch(e, host as never);
  return { status: res.status.mock.calls[0]?.[0], body: res.json.mock.calls[0]?.[0] };
}

describe('ApiExceptionFilter', () => {
  it('answers 503 "busy" when no database connection came free in time (an overload, not a 500)', () => {
    expect(answer(new ConnectionAcquireTimeoutError(new Error('Operation timeout')))).toEqual({
      status: 503,
      body: { statusCode: 503, message: 'The server is busy right now; try again shortly' },
    });
  });

  it('answers 503 "not reachable" when the database refuses connections', () => {
    expect(answer(new ConnectionRefusedError(new Error('connect ECONNREFUSED 127.0.0.1:3308'))).status).toBe(503);
  });

  it('answers an unknown error with a 500 that shows no internals', () => {
    expect(answer(new Error('secret detail'))).toEqual({ status: 500, body: { statusCode: 500, message: 'Something went wrong on the server; it has been logged' } });
  });
});
