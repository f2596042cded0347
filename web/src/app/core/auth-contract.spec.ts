import { CSRF_COOKIE, CSRF_HEADER, ROLES, SIGN_IN_PATH, SIGN_OUT_PATH, hasRole } from '@shared/auth';
import { CSRF_COOKIE_NAME, CSRF_HEADER_NAME, ROLE_ORDER, SIGN_IN_URL, SIGN_OUT_URL, isRoleAtLeast } from './auth-contract';

describe('auth-contract (web copy of shared/auth.ts values)', () => {
  it('uses the same CSRF cookie and header names as the server contract', () => {
    expect([CSRF_COOKIE_NAME, CSRF_HEADER_NAME]).toEqual([CSRF_COOKIE, CSRF_HEADER]);
  });

  it('uses the same sign-in and sign-out paths as the server contract', () => {
    expect([SIGN_IN_URL, SIGN_OUT_URL]).toEqual([SIGN_IN_PATH, SIGN_OUT_PATH]);
  });

  it('orders roles exactly as shared/auth.ts does', () => {
    expect(ROLE_ORDER).toEqual(ROLES);
  });

  it('agrees with hasRole for every pair of roles', () => {
    for (const role of ROLES) {
      for (const needed of ROLES) {
        expect([role, needed, isRoleAtLeast(role, needed)]).toEqual([role, needed, hasRole(role, needed)]);
      }
    }
  });
});
