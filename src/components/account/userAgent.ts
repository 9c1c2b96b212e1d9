/**
 * A session's User-Agent in words a person recognises ("Chromium on Linux", "Safari on an
 * iPhone", "A script or program"). Only the common families are named; anything else shows
 * the start of the string as it came.
 */
const BROWSERS: [RegExp, string][] = [
  [/Edg\//, 'Edge'],
  [/OPR\//, 'Opera'],
  [/Firefox\//, 'Firefox'],
  [/Chromium\//, 'Chromium'],
  [/Chrome\//, 'Chrome'],
  [/Version\/[\d.]+.*Safari\//, 'Safari'],
];

const SYSTEMS: [RegExp, string][] = [
  [/iPhone/, 'an iPhone'],
  [/iPad/, 'an iPad'],
  [/Android/, 'Android'],
  [/Windows/, 'Windows'],
  [/Mac OS X|Macintosh/, 'macOS'],
  [/CrOS/, 'ChromeOS'],
  [/Linux/, 'Linux'],
];

const PROGRAMS = /^(curl|wget|node|undici|python|axios|go-http-client|okhttp|java|powershell|httpie|postman)/i;

export function describeUserAgent(userAgent: string | null | undefined): string {
  const ua = (userAgent ?? '').trim();
  if (!ua) return 'Unknown device';
  if (PROGRAMS.test(ua)) return `A script or program (${ua.split(/[\s/]/)[0]})`;
  const browser = BROWSERS.find(([re]) => re.test(ua))?.[1];
  const system = SYSTEMS.find(([re]) => re.test(ua))?.[1];
  if (browser && system) return `${browser} on ${system}`;
  if (browser) return browser;
  if (system) return `A browser on ${system}`;
  return ua.length > 60 ? `${ua.slice(0, 57)}…` : ua;
}

/** Whether the session came from a phone or tablet (for its icon). */
export function isPhone(userAgent: string | null | undefined): boolean {
  return /iPhone|iPad|Android|Mobile/.test(userAgent ?? '');
}
