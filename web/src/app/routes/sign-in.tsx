import { useNavigate, useSearchParams } from 'react-router-dom';
import { CautionNote } from '../../components/ui/caution-note';
import { Notice } from '../../components/ui/notice';
import { SignInForm } from '../../features/auth/components/sign-in-form';
import { Wordmark } from '../shell/wordmark';

const REASONS: Record<string, string> = {
  expired: 'Your session ended. Sign in again to carry on.',
  'signed-out': 'You are signed out.',
  'password-changed': 'Password changed. Sign in with your new password.',
};

/** Only same-site paths, so a crafted link cannot bounce the user elsewhere after sign-in. */
function safeNext(next: string | null): string {
  return next && next.startsWith('/') && !next.startsWith('//') && !next.startsWith('/sign-in') ? next : '/';
}

export function SignInRoute() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const reason = REASONS[params.get('reason') ?? ''];

  return (
    <div className="grid min-h-full place-items-center bg-canvas p-6">
      <main className="grid w-full max-w-4xl overflow-hidden rounded-xl border border-line bg-panel md:grid-cols-[1.1fr_1fr]">
        <section className="flex flex-col justify-between gap-10 bg-panel-2 p-8" aria-label="About Ferrisight">
          <div className="flex flex-col gap-4">
            <Wordmark size="lg" link={false} />
            <p className="text-xl leading-snug">
              The live Fe³⁺/Fe²⁺ ratio of every leach tank, worked out from its ORP probe, with the band it should sit in.
            </p>
          </div>
          <svg viewBox="0 0 320 64" className="w-full text-ink" role="img" aria-label="A ratio marker sitting inside its band on a logarithmic scale">
            <line x1="8" x2="312" y1="40" y2="40" stroke="currentColor" strokeOpacity="0.4" />
            {[0.1, 1, 10, 100].map((v, i) => (
              <g key={v}>
                <line x1={8 + i * 101} x2={8 + i * 101} y1="36" y2="44" stroke="currentColor" strokeOpacity="0.5" />
                <text x={8 + i * 101} y="60" fontSize="11" textAnchor="middle" fill="currentColor" fillOpacity="0.7">
                  {v}
                </text>
              </g>
            ))}
            <rect x="200" y="33" width="48" height="14" fill="currentColor" fillOpacity="0.25" />
            <line x1="212" x2="236" y1="40" y2="40" stroke="currentColor" strokeWidth="1.5" />
            <path d="M 218 12 L 230 12 L 224 30 Z" fill="currentColor" />
          </svg>
        </section>
        <section className="flex flex-col gap-5 p-8" aria-labelledby="sign-in-title">
          <h1 id="sign-in-title" className="text-2xl font-bold">
            Sign in
          </h1>
          {reason && <Notice tone="info">{reason}</Notice>}
          <SignInForm onSignedIn={() => navigate(safeNext(params.get('next')), { replace: true })} />
          <CautionNote className="mt-auto border-t border-line pt-4" />
        </section>
      </main>
    </div>
  );
}
