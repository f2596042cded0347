import { mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ensureWebBuild, isWebBuildStale } from './web-build';

describe('ensureWebBuild', () => {
  let root: string;
  const quiet = () => undefined;
  const at = (path: string, secondsAgo: number) => {
    const t = new Date(Date.now() - secondsAgo * 1000);
    utimesSync(path, t, t);
  };
  const writeIndex = (r: string) => {
    mkdirSync(join(r, 'dist/web/browser'), { recursive: true });
    writeFileSync(join(r, 'dist/web/browser/index.html'), '<!doctype html>');
  };

  beforeEach(() => {
    root = mkdtempSync(join(tmpdir(), 'qt-webbuild-'));
    mkdirSync(join(root, 'web/src/app'), { recursive: true });
    mkdirSync(join(root, 'shared'));
    writeFileSync(join(root, 'angular.json'), '{}');
    writeFileSync(join(root, 'web/src/app/home.ts'), 'x');
    writeFileSync(join(root, 'shared/auth.ts'), 'x');
    for (const p of ['angular.json', 'web/src/app/home.ts', 'shared/auth.ts']) at(join(root, p), 100);
  });
  afterEach(() => rmSync(root, { recursive: true, force: true }));

  it('skips when there is no angular.json yet', () => {
    rmSync(join(root, 'angular.json'));
    const build = jest.fn(() => 0);
    expect(ensureWebBuild({ root, log: quiet, build })).toBe('skipped-no-angular-json');
    expect(build).not.toHaveBeenCalled();
  });

  it('builds when the output is missing', () => {
    const build = jest.fn((r: string) => (writeIndex(r), 0));
    expect(ensureWebBuild({ root, log: quiet, build })).toBe('built');
    expect(build).toHaveBeenCalledWith(root);
  });

  it('does nothing when the output is newer than every source', () => {
    writeIndex(root);
    const build = jest.fn(() => 0);
    expect(ensureWebBuild({ root, log: quiet, build })).toBe('fresh');
    expect(build).not.toHaveBeenCalled();
  });

  it.each(['web/src/app/home.ts', 'shared/auth.ts', 'angular.json'])('rebuilds after %s changes', (source) => {
    writeIndex(root);
    at(join(root, 'dist/web/browser/index.html'), 50);
    at(join(root, source), 10);
    expect(isWebBuildStale(root, 'dist/web/browser')).toBe(true);
  });

  it('ignores node_modules and .angular caches inside web/', () => {
    writeIndex(root);
    at(join(root, 'dist/web/browser/index.html'), 50);
    mkdirSync(join(root, 'web/.angular'));
    writeFileSync(join(root, 'web/.angular/cache'), 'x');
    expect(isWebBuildStale(root, 'dist/web/browser')).toBe(false);
  });

  it('throws when the build fails or writes no index.html', () => {
    expect(() => ensureWebBuild({ root, log: quiet, build: () => 1 })).toThrow(/failed \(exit 1\)/);
    expect(() => ensureWebBuild({ root, log: quiet, build: () => 0 })).toThrow(/index\.html is missing/);
  });
});
