import { describe, expect, it } from 'vitest';
import { cacheControlFor } from '../../server/static';

describe('cache headers of the built client', () => {
  it('keeps content-hashed assets (and their .br / .gz copies) for a year', () => {
    for (const file of [
      '/srv/dist/assets/index-fdG373jM.js',
      '/srv/dist/assets/index-DgLf69L-.css.br',
      '/srv/dist/assets/QTable-BeKumtSB.js.gz',
      '/srv/dist/assets/noto-sans-latin-400-normal-C2Y8JxHr.woff2',
    ]) {
      expect(cacheControlFor(file)).toBe('public, max-age=31536000, immutable');
    }
  });

  it('asks again for index.html and files without a hash', () => {
    for (const file of ['/srv/dist/index.html', '/srv/dist/favicon.svg', '/srv/dist/assets/logo.svg']) {
      expect(cacheControlFor(file)).toBe('no-cache');
    }
  });
});
