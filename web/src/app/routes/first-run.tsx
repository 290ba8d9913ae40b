import { useNavigate } from 'react-router-dom';
import { CautionNote } from '../../components/ui/caution-note';
import { FirstRunForm } from '../../features/auth/components/first-run-form';
import { Wordmark } from '../shell/wordmark';

/** The set-up link carries its token after '#', so it never reaches a server log. */
const tokenFromHash = () => new URLSearchParams(window.location.hash.slice(1)).get('token') ?? '';

export function FirstRunRoute() {
  const navigate = useNavigate();
  return (
    <div className="grid min-h-full place-items-center bg-canvas p-6">
      <main className="flex w-full max-w-lg flex-col gap-6 rounded-xl border border-line bg-panel p-8">
        <Wordmark size="lg" link={false} />
        <div className="flex flex-col gap-2">
          <h1 className="text-2xl font-bold">Set up this Ferrisight</h1>
          <p>Create the first admin. Then add your site, its circuits, tanks, probes and gateways in Plant setup, and add the other people.</p>
        </div>
        <FirstRunForm token={tokenFromHash()} onDone={() => navigate('/plant-setup', { replace: true })} />
        <CautionNote />
      </main>
    </div>
  );
}
