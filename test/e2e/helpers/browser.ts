/**
 * Real Chromium through playwright-core (the system's /usr/bin/chromium; never a downloaded one).
 * Without that browser the e2e tests are skipped with a loud message, unless REQUIRE_BROWSER=1,
 * in which case they fail.
 */
import { existsSync } from 'node:fs';
import { chromium, type Browser } from 'playwright-core';

export const CHROMIUM = '/usr/bin/chromium';

export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
];

/** True when the e2e tests can run; logs loudly (or throws under REQUIRE_BROWSER=1) when they cannot. */
export function browserAvailable(): boolean {
  if (existsSync(CHROMIUM)) return true;
  const message = `\n\n!!! ${CHROMIUM} is missing: the end-to-end tests are SKIPPED. Install Chromium (Debian package "chromium") to run them. !!!\n\n`;
  if (process.env['REQUIRE_BROWSER'] === '1') throw new Error(message);
  console.warn(message);
  return false;
}

export function launchChromium(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS, headless: true });
}
