import { Link } from 'react-router-dom';
import { catalogueLists, type CatalogueList } from '@plumbline/contracts';
import { paths } from '../../../config/paths.ts';
import { catalogueListLabels } from '../utils/list-labels.ts';

/** The six catalogue lists as a side list; the current one carries the brass weight, as in the main navigation. */
export function CatalogueListNav({ current }: { current: CatalogueList }) {
  return (
    <nav aria-label="Catalogue lists" className="md:w-44 md:shrink-0">
      <ul className="flex gap-1 overflow-x-auto md:flex-col md:gap-0.5">
        {catalogueLists.map((list) => {
          const active = list === current;
          return (
            <li key={list}>
              <Link
                to={paths.network.catalogue.getHref(list)}
                aria-current={active ? 'page' : undefined}
                className={`relative flex items-center rounded-md px-3 py-2 text-sm whitespace-nowrap md:pl-6 ${
                  active
                    ? 'bg-white font-medium text-plumb-900 shadow-xs ring-1 ring-slate-200'
                    : 'text-slate-700 hover:bg-white/70 hover:text-plumb-900'
                }`}
              >
                <span
                  aria-hidden="true"
                  className={`absolute top-1/2 left-2.5 hidden size-[7px] -translate-y-1/2 rotate-45 md:block ${active ? 'bg-brass-500' : 'bg-transparent'}`}
                />
                {catalogueListLabels[list].title}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
