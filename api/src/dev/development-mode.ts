/**
 * Development mode: the local fake sign-in provider is in use and the app is reachable from this
 * machine only (loopback PUBLIC_URL and HOST). Development aids that expose other people's data,
 * such as the fake SMTP server's mailbox, exist only then, never next to a real OAuth app or
 * on an address other machines can reach (issue 13).
 */
import { isLoopbackHost, type AppConfig } from '../config';

/** Whether `config` describes a development machine (see the file comment). */
export function isDevelopmentMode(config: Pick<AppConfig, 'oauth' | 'publicUrl' | 'host'>): boolean {
  return config.oauth.mode === 'fake' && isLoopbackHost(new URL(config.publicUrl).hostname) && isLoopbackHost(config.host);
}
