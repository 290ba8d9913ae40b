import type { SessionUser } from '@shared/schemas/auth';
import { ImportPanel } from './import-panel';
import { ReadingsExportForm, type TankChoice } from './readings-export-form';

/** Readings out (everyone) and in (metallurgists and admins: the server checks too). */
export function ReadingsView({ tanks, timeZone, user }: { tanks: TankChoice[]; timeZone: string; user: SessionUser }) {
  const canImport = user.role === 'metallurgist' || user.role === 'admin';
  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Readings in and out</h1>
      <ReadingsExportForm tanks={tanks} timeZone={timeZone} />
      {canImport && <ImportPanel timeZone={timeZone} />}
    </div>
  );
}
