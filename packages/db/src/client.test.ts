import { describe, expect, it } from 'vitest';
import { isDatabaseUnavailable } from './client.ts';

// SQLSTATE codes from the PostgreSQL documentation, Appendix A "PostgreSQL Error Codes": class 08
// (connection exception), class 57 (operator intervention: 57P01 admin_shutdown, 57P03
// cannot_connect_now), 53300 too_many_connections; 42601 syntax_error and 23505 unique_violation are
// errors of the statement, not of the connection. The errno names are Node's (ECONNREFUSED, EPIPE).
describe('isDatabaseUnavailable', () => {
  it('when the server is shutting down, starting up or refuses connections, then it says unavailable', () => {
    for (const code of ['57P01', '57P03', '08006', '53300', 'ECONNREFUSED', 'EPIPE', 'ECONNRESET'])
      expect(isDatabaseUnavailable(Object.assign(new Error('x'), { code })), code).toBe(true);
    expect(isDatabaseUnavailable(new Error('Connection terminated unexpectedly'))).toBe(true);
  });

  it('when a query wrapper carries the driver error as its cause, then the cause decides', () => {
    const driver = Object.assign(new Error('terminating connection due to administrator command'), {
      code: '57P01',
    });
    expect(isDatabaseUnavailable(new Error('Failed query: select 1', { cause: driver }))).toBe(true);
  });

  it('when the statement itself is wrong, then it is not unavailability', () => {
    for (const code of ['42601', '23505'])
      expect(isDatabaseUnavailable(Object.assign(new Error('x'), { code })), code).toBe(false);
    expect(isDatabaseUnavailable(new Error('Failed query: select'))).toBe(false);
    expect(isDatabaseUnavailable(undefined)).toBe(false);
  });
});
