import { Link } from 'react-router-dom';
import { ContentLayout } from '../../components/layouts/content-layout.tsx';
import { paths } from '../../config/paths.ts';

export default function NotFoundRoute() {
  return (
    <ContentLayout title="Page not found" area="Error 404">
      <div className="max-w-2xl space-y-4 text-[0.95rem] text-slate-700">
        <p>There is no page at this address. It may have moved, or the link may be mistyped.</p>
        <p>
          <Link
            to={paths.home.getHref()}
            className="font-medium text-plumb-700 underline underline-offset-4 hover:text-plumb-900"
          >
            Go to your home page
          </Link>
        </p>
      </div>
    </ContentLayout>
  );
}
