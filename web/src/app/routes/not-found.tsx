import { Link } from 'react-router-dom';

export function NotFoundRoute() {
  return (
    <div className="mx-auto my-10 max-w-lg rounded-lg border border-line bg-panel p-6">
      <h1 className="text-2xl font-bold">Nothing here</h1>
      <p className="mt-2 text-ink-muted">This address is not a Ferrisight screen. It may be mistyped or out of date.</p>
      <Link to="/" className="mt-4 inline-block text-info-ink underline">
        Go to the Floor
      </Link>
    </div>
  );
}
