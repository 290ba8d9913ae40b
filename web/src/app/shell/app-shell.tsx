import { useEffect } from 'react';
import { Navigate, Outlet, useLocation } from 'react-router-dom';
import { NewAlarmBanner } from '../../features/alarms/components/new-alarm-banner';
import { PlantAlarmBanner } from '../../features/alarms/components/plant-alarm-banner';
import { useAlarmLiveSync } from '../../features/alarms/hooks/use-alarm-live-sync';
import { useTankAlarmBadges } from '../../features/alarms/hooks/use-tank-alarm-badges';
import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { usePlantLiveSync } from '../../features/floor/hooks/use-plant-live-sync';
import { connectSocket, disconnectSocket, useSocketEvent } from '../../lib/socket';
import { TankAlarmsProvider } from '../../lib/tank-alarms';
import { endSession } from '../session';
import { PLANT_HEALTH_PATH, SCREENS } from '../screens';
import { Header } from './header';

/** Signed-in frame: header, live connection, and the screen. */
export function AppShell() {
  const user = useSessionUser();
  const location = useLocation();

  useEffect(() => {
    connectSocket();
    return () => disconnectSocket();
  }, []);
  useSocketEvent('session:expired', () => void endSession('expired'));
  usePlantLiveSync();
  useAlarmLiveSync();
  const tankAlarms = useTankAlarmBadges();

  if (!user) return <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname + location.search)}`} replace />;

  return (
    <div className="flex h-full flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-50 focus:rounded focus:bg-panel focus:px-3 focus:py-2">
        Skip to content
      </a>
      <Header user={user} />
      <PlantAlarmBanner role={user.role} deskPath={SCREENS.alarms.path} healthPath={user.role === 'admin' ? PLANT_HEALTH_PATH : undefined} />
      <NewAlarmBanner deskPath={SCREENS.alarms.path} />
      <main id="main" className="relative min-h-0 flex-1 overflow-auto p-3">
        <TankAlarmsProvider value={tankAlarms}>
          <Outlet />
        </TankAlarmsProvider>
      </main>
    </div>
  );
}
