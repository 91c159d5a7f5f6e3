// The Plumbline mark: a fixing point, a thin vertical line and a brass weight, drawn for this product.
type PlumbMarkProps = {
  className?: string;
  /** Colour of the fixing point and line; the weight is always brass. */
  lineClassName?: string;
};

export function PlumbMark({ className = 'h-8 w-6', lineClassName = 'text-current' }: PlumbMarkProps) {
  return (
    <svg viewBox="0 0 24 32" className={className} aria-hidden="true" focusable="false">
      <g className={lineClassName}>
        <rect x="6" y="1.5" width="12" height="2" rx="1" fill="currentColor" />
        <line x1="12" y1="3.5" x2="12" y2="18" stroke="currentColor" strokeWidth="1.25" />
      </g>
      <path d="M8.5 18h7v2.6L12 30.5 8.5 20.6Z" className="fill-brass-400" />
      <path d="M12 18h3.5v2.6L12 30.5Z" className="fill-brass-600" />
    </svg>
  );
}

export function Logo({ tone = 'dark' }: { tone?: 'dark' | 'light' }) {
  const onDark = tone === 'dark';
  return (
    <span className="inline-flex items-center gap-2">
      <PlumbMark className="h-8 w-6" lineClassName={onDark ? 'text-plumb-100' : 'text-plumb-800'} />
      <span className={`text-lg font-semibold tracking-[0.02em] ${onDark ? 'text-white' : 'text-plumb-900'}`}>
        Plumbline
      </span>
    </span>
  );
}
