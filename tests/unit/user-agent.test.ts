import { describe, expect, it } from 'vitest';
import { describeUserAgent, isPhone } from '@/components/account/userAgent';

// User-Agent strings as the browsers send them (formats from the browsers' own documentation of
// their UA strings; the version numbers are made up).
describe('describeUserAgent', () => {
  it('names the common browsers and systems in words', () => {
    expect(describeUserAgent('Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Safari/537.36')).toBe(
      'Chrome on Linux',
    );
    expect(describeUserAgent('Mozilla/5.0 (Windows NT 10.0; Win64; x64; rv:133.0) Gecko/20100101 Firefox/133.0')).toBe(
      'Firefox on Windows',
    );
    expect(
      describeUserAgent(
        'Mozilla/5.0 (iPhone; CPU iPhone OS 17_5 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.5 Mobile/15E148 Safari/604.1',
      ),
    ).toBe('Safari on an iPhone');
    expect(
      describeUserAgent(
        'Mozilla/5.0 (Windows NT 10.0; Win64; x64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Safari/537.36 Edg/131.0.0.0',
      ),
    ).toBe('Edge on Windows');
    expect(
      describeUserAgent('Mozilla/5.0 (Linux; Android 14; SM-X200) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/131.0.0.0 Safari/537.36'),
    ).toBe('Chrome on Android');
  });

  it('says when a script or program signed in, and when nothing is known', () => {
    expect(describeUserAgent('curl/8.5.0')).toBe('A script or program (curl)');
    expect(describeUserAgent('node')).toBe('A script or program (node)');
    expect(describeUserAgent(null)).toBe('Unknown device');
    expect(describeUserAgent('')).toBe('Unknown device');
  });

  it('tells phones and tablets from the rest', () => {
    expect(isPhone('Mozilla/5.0 (Linux; Android 14; SM-X200) Chrome/131.0.0.0 Safari/537.36')).toBe(true);
    expect(isPhone('Mozilla/5.0 (X11; Linux x86_64) Chrome/131.0.0.0 Safari/537.36')).toBe(false);
  });
});
