export const mainContentId = 'main-content';

/** First focusable element on every page: jumps past the header and navigation. */
export function SkipLink() {
  return (
    <a
      href={`#${mainContentId}`}
      className="sr-only rounded-md bg-white px-4 py-2 text-sm font-medium text-plumb-900 shadow-lg focus:not-sr-only focus:absolute focus:top-3 focus:left-3 focus:z-50"
    >
      Skip to main content
    </a>
  );
}
