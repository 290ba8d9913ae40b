import { Link } from 'react-router-dom';
import type { Screen } from '../screens';
import { RoleGate } from './role-gate';

/** An honest placeholder for a screen that is planned but not built. */
export function LaterRoute({ screen }: { screen: Screen }) {
  return (
    <RoleGate roles={screen.roles}>
      <div className="mx-auto my-10 max-w-lg rounded-lg border border-dashed border-line-strong bg-panel p-6">
        <h1 className="text-2xl font-bold">{screen.name}</h1>
        <p className="mt-2 text-ink-muted">Arrives in a later release.</p>
        <Link to="/" className="mt-4 inline-block text-info-ink underline">
          Back to the Floor
        </Link>
      </div>
    </RoleGate>
  );
}
