import { ConfigError, DEV_SESSION_SECRET, loadConfig } from './config';

describe('loadConfig', () => {
  it('gives working defaults with nothing set', () => {
    const { config, warnings } = loadConfig({});
    expect(config).toMatchObject({
      port: 4300,
      host: '127.0.0.1',
      databaseUrl: undefined,
      publicUrl: 'http://127.0.0.1:4300',
      oauth: { mode: 'fake', port: 4301 },
      adminLogins: [],
      webDist: 'dist/web/browser',
      logLevel: 'info',
      sessionSecret: DEV_SESSION_SECRET,
      isDevSessionSecret: true,
    });
    expect(warnings.join('\n')).toMatch(/SESSION_SECRET/);
  });

  it('is silent under NODE_ENV=test unless LOG_LEVEL says otherwise', () => {
    expect(loadConfig({ NODE_ENV: 'test' }).config.logLevel).toBe('silent');
    expect(loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'debug' }).config.logLevel).toBe('debug');
  });

  it('parses every variable', () => {
    const { config, warnings } = loadConfig({
      PORT: '8080', HOST: '0.0.0.0', DATABASE_URL: 'postgres://u@db:5432/qt', SESSION_SECRET: 'x'.repeat(32),
      PUBLIC_URL: 'https://bench.example.org/', GITHUB_CLIENT_ID: 'id', GITHUB_CLIENT_SECRET: 'secret',
      ADMIN_LOGINS: ' Alice , bob,, ', SMTP_URL: 'smtp://mail:25', WEB_DIST: '/srv/web', LOG_LEVEL: 'warn',
      AUTH_RATE_LIMIT: '5', AUTH_RATE_WINDOW_MS: '60000', TRUST_PROXY: '1', API_TOKEN_RATE_LIMIT: '30', API_TOKEN_RATE_WINDOW_MS: '5000',
    });
    expect(warnings).toEqual([]);
    expect(config).toMatchObject({
      port: 8080, host: '0.0.0.0', databaseUrl: 'postgres://u@db:5432/qt', publicUrl: 'https://bench.example.org',
      oauth: { mode: 'github', clientId: 'id', clientSecret: 'secret' }, adminLogins: ['alice', 'bob'],
      smtpUrl: 'smtp://mail:25', webDist: '/srv/web', logLevel: 'warn', authRateLimit: 5, authRateWindowMs: 60000, trustProxy: 1, tokenRateLimit: 30, tokenRateWindowMs: 5000,
      isDevSessionSecret: false,
    });
  });

  it('names each bad variable in one error', () => {
    let caught: unknown;
    try {
      loadConfig({ PORT: 'eighty', DATABASE_URL: 'mysql://x/y', LOG_LEVEL: 'loud', SESSION_SECRET: 'short' });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(ConfigError);
    const problems = (caught as ConfigError).problems.join('\n');
    for (const name of ['PORT', 'DATABASE_URL', 'LOG_LEVEL', 'SESSION_SECRET']) expect(problems).toContain(name);
  });

  it('refuses the fake sign-in provider and the dev secret on a public host', () => {
    expect(() => loadConfig({ PUBLIC_URL: 'https://bench.example.org' })).toThrow(/GITHUB_CLIENT_ID[\s\S]*SESSION_SECRET/);
  });

  it('refuses a wildcard or public HOST with the fake sign-in provider and the development secret, one line per problem', () => {
    let caught: unknown;
    try {
      loadConfig({ HOST: '0.0.0.0' });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(ConfigError);
    const { problems } = caught as ConfigError;
    expect(problems).toHaveLength(2);
    expect(problems[0]).toMatch(/^HOST: .*0\.0\.0\.0.*not a loopback address.*GITHUB_CLIENT_ID/);
    expect(problems[1]).toMatch(/^SESSION_SECRET: required when HOST .*0\.0\.0\.0/);
    for (const line of problems) expect(line).not.toContain('\n');
    expect(() => loadConfig({ HOST: '192.168.1.20', SESSION_SECRET: 'x'.repeat(32) })).toThrow(/HOST: .*192\.168\.1\.20/);
    expect(() => loadConfig({ HOST: '::', GITHUB_CLIENT_ID: 'id', GITHUB_CLIENT_SECRET: 'secret' })).toThrow(/SESSION_SECRET: required when HOST/);
  });

  it('accepts loopback hosts in development and any host with a GitHub app and a secret', () => {
    for (const host of ['127.0.0.1', 'localhost', '::1', '127.0.0.2']) expect(loadConfig({ HOST: host }).config.host).toBe(host);
    expect(loadConfig({ HOST: '0.0.0.0', SESSION_SECRET: 'x'.repeat(32), GITHUB_CLIENT_ID: 'id', GITHUB_CLIENT_SECRET: 'secret' }).config.host).toBe('0.0.0.0');
  });

  it('wants both GitHub credentials or neither', () => {
    expect(() => loadConfig({ GITHUB_CLIENT_ID: 'only-id' })).toThrow(/set both or neither/);
  });

  it('reads the uploads per user and the default storage quota, with documented defaults', () => {
    expect(loadConfig({}).config).toMatchObject({ uploadsPerUser: 2, storageQuota: { files: 5000, cells: 16_777_216, bytes: 268_435_456 } });
    const { config } = loadConfig({ UPLOADS_PER_USER: '1', QUOTA_FILES: '10', QUOTA_CELLS: '0', QUOTA_BYTES: '1048576' });
    expect(config).toMatchObject({ uploadsPerUser: 1, storageQuota: { files: 10, cells: 0, bytes: 1_048_576 } });
    expect(() => loadConfig({ UPLOADS_PER_USER: '0', QUOTA_BYTES: '-1' })).toThrow(/UPLOADS_PER_USER[\s\S]*QUOTA_BYTES/);
  });
});
