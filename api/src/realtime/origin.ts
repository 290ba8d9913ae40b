import type { IncomingHttpHeaders } from 'node:http';

/**
 * socket.io accepts a browser connection only from the app's own pages: an Origin whose host
 * is the Host the request came to (any address the site reaches the app by), or PUBLIC_URL's
 * origin. Browsers send Origin with every websocket and every cross-origin request, so a page
 * elsewhere cannot ride on the session cookie. A client without Origin is not a browser page
 * and still has to present a valid session.
 */
export function originAllowed(headers: IncomingHttpHeaders, publicUrl?: string): boolean {
  const origin = headers.origin;
  if (origin === undefined) return true;
  let url: URL;
  try {
    url = new URL(origin);
  } catch {
    return false; // "null" (sandboxed frames, file pages) and garbage
  }
  if (publicUrl && url.origin === new URL(publicUrl).origin) return true;
  return headers.host !== undefined && url.host === headers.host.toLowerCase();
}
