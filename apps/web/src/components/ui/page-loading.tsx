import { Spinner } from './spinner.tsx';

export function PageLoading() {
  return (
    <div className="flex min-h-[40vh] items-center justify-center text-plumb-700">
      <Spinner label="Loading" />
    </div>
  );
}
