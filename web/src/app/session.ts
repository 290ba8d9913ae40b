import { setUnauthorizedHandler } from '../lib/api-client';
import { queryClient } from '../lib/query-client';
import { disconnectSocket } from '../lib/socket';

export type EndReason = 'expired' | 'signed-out' | 'password-changed';

type Navigate = (to: string, opts?: { replace?: boolean }) => Promise<void>;
let navigate: Navigate = async (to) => window.location.assign(to);
let ending = false;

/**
 * Every way a session ends (sign-out, expiry, 401, password change) goes through here:
 * close the socket, go to sign-in, then drop everything cached for that user.
 */
export async function endSession(reason: EndReason): Promise<void> {
  if (ending) return;
  ending = true;
  try {
    disconnectSocket();
    const here = window.location.pathname + window.location.search;
    const keep = reason === 'expired' && !here.startsWith('/sign-in') && here !== '/';
    if (!window.location.pathname.startsWith('/sign-in')) {
      await navigate(`/sign-in?reason=${reason}${keep ? `&next=${encodeURIComponent(here)}` : ''}`, { replace: true });
    }
    queryClient.clear();
  } finally {
    ending = false;
  }
}

/** Called once by the router module with its navigate, so 401s keep the single-page app. */
export function installSessionHandlers(routerNavigate: Navigate): void {
  navigate = routerNavigate;
  setUnauthorizedHandler(() => void endSession('expired'));
}
