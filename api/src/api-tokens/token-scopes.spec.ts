import { scopeNeeded } from './token-scopes';

describe('scopeNeeded', () => {
  it('asks read for every GET and HEAD outside the session-only paths', () => {
    expect(scopeNeeded('GET', '/instance-sets/4')).toBe('read');
    expect(scopeNeeded('head', '/maps/9/download')).toBe('read');
    expect(scopeNeeded('GET', '/sweeps/3/events')).toBe('read');
  });

  it('opens exactly the plan submission with submit and the sweep launch, preview and cancel with sweep', () => {
    expect(scopeNeeded('POST', '/submissions')).toBe('submit');
    expect(scopeNeeded('POST', '/submissions/')).toBe('submit');
    expect(scopeNeeded('POST', '/submissions/batches')).toBe('submit');
    expect(scopeNeeded('POST', '/sweeps')).toBe('sweep');
    expect(scopeNeeded('POST', '/sweeps/preview')).toBe('sweep');
    expect(scopeNeeded('POST', '/sweeps/12/cancel')).toBe('sweep');
  });

  it('opens no other state-changing route, whatever its method', () => {
    const closed: Array<[string, string]> = [
      ['POST', '/instance-sets'], ['PATCH', '/instance-sets/4'], ['DELETE', '/instance-sets/4'], ['POST', '/instance-sets/4/files'],
      ['DELETE', '/maps/9'], ['POST', '/executions'], ['PATCH', '/me/settings'], ['PATCH', '/admin/users/2'],
      ['PUT', '/submissions'], ['DELETE', '/submissions'], ['POST', '/submissions/profiles'], ['POST', '/submissions/batches/3'], ['POST', '/sweeps/12/cancel/now'],
      ['OPTIONS', '/sweeps'],
    ];
    expect(closed.filter(([m, p]) => scopeNeeded(m, p) !== null)).toEqual([]);
  });

  it('keeps the token routes and sign-in for the browser session, reads included', () => {
    for (const [method, path] of [['GET', '/me/tokens'], ['POST', '/me/tokens'], ['DELETE', '/me/tokens/3'], ['GET', '/auth/github'], ['POST', '/auth/logout']]) {
      expect([method, path, scopeNeeded(method, path)]).toEqual([method, path, null]);
    }
    // Express routes paths case-insensitively, so the scope table must too.
    expect(scopeNeeded('GET', '/ME/Tokens')).toBeNull();
    expect(scopeNeeded('POST', '/Submissions')).toBe('submit');
    expect(scopeNeeded('GET', '/me')).toBe('read');
    expect(scopeNeeded('GET', '/me/tokensmith')).toBe('read');
  });
});
