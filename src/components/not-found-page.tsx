import { Link, useLocation } from 'react-router-dom';
import { pathTo } from '@/paths';

/** An address the app does not know: said plainly, inside the app's frame, with ways back. */
export function NotFoundPage() {
  const location = useLocation();
  return (
    <section className="card mx-auto max-w-xl space-y-3" aria-labelledby="not-found-title">
      <h1 id="not-found-title" className="text-2xl font-bold">
        There is no page here
      </h1>
      <p>
        Nothing in Twistlog lives at <code className="break-all">{location.pathname}</code>. The link may be old, or the address mistyped.
      </p>
      <p className="flex flex-wrap gap-2">
        <Link className="btn-primary" to={pathTo('home')}>
          Back to the start
        </Link>
        <button type="button" className="btn" onClick={() => window.history.back()}>
          Go back one page
        </button>
      </p>
    </section>
  );
}
