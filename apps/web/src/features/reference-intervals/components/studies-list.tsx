import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { paths } from '../../../config/paths.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { Alert } from '../../../components/ui/alert.tsx';
import { isRunning, riKeys } from '../api/ri-keys.ts';

const methodLabels = {
  nonparametric: 'Nonparametric',
  robust: 'Robust (Horn & Pesce)',
  indirect: 'Indirect',
};

export function StudiesList() {
  const studies = useQuery({
    ...riKeys.studies(),
    refetchInterval: (q) => (q.state.data?.some((s) => isRunning(s.status)) ? 1000 : false),
  });
  if (studies.isPending) return <PageLoading />;
  if (studies.isError) return <Alert tone="error">{studies.error.message}</Alert>;
  if (studies.data.length === 0)
    return (
      <EmptyState
        title="No studies yet"
        description="A supervisor can start one from the lab's patient results."
      />
    );
  return (
    <table className="w-full text-left text-sm">
      <thead className="border-b border-slate-200 text-slate-600">
        <tr>
          <th className="py-2 pr-4 font-medium">Study</th>
          <th className="py-2 pr-4 font-medium">Analyte</th>
          <th className="py-2 pr-4 font-medium">Method</th>
          <th className="py-2 pr-4 font-medium">Status</th>
          <th className="py-2 pr-4 font-medium">Approved version</th>
        </tr>
      </thead>
      <tbody>
        {studies.data.map((s) => (
          <tr key={s.id} className="border-b border-slate-100">
            <td className="py-2 pr-4">
              <Link className="font-medium text-plumb-800 underline" to={paths.lab.riStudy.getHref(s.id)}>
                {s.name}
              </Link>
            </td>
            <td className="py-2 pr-4">{s.analyte.name}</td>
            <td className="py-2 pr-4">{methodLabels[s.method]}</td>
            <td className="py-2 pr-4">
              {s.status}
              {isRunning(s.status) ? ` (${Math.round(s.progress * 100)} %)` : ''}
            </td>
            <td className="py-2 pr-4">{s.approvedVersion ?? '—'}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
