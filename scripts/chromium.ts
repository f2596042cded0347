/**
 * Debian's Chromium for the end-to-end tests: installed with apt-get when missing (never a
 * browser download of a test tool's own), with the launch flags this machine needs.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { userInfo } from 'node:os';

/** Where the end-to-end tests expect Debian's Chromium. */
export const CHROMIUM_PATH = '/usr/bin/chromium';

/** Installs Debian's chromium package when /usr/bin/chromium is missing. */
export function ensureChromium(): void {
  if (existsSync(CHROMIUM_PATH)) return;
  if (userInfo().uid !== 0) {
    throw new Error(`${CHROMIUM_PATH} is missing: install Debian's "chromium" package (sudo apt-get install -y chromium).`);
  }
  console.error('Installing Debian package "chromium" for the end-to-end tests…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  const install = spawnSync('apt-get', ['install', '-y', '-qq', 'chromium'], { stdio: 'inherit', env });
  if (install.status !== 0 || !existsSync(CHROMIUM_PATH)) throw new Error('apt-get could not install chromium.');
}
