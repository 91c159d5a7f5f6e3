// Keyboard and pointer access to a chart's points with one tab stop: Tab enters the points, the arrow
// keys (and Home/End) move between them in reading order, and the point in focus or under the pointer
// is the "active" one the chart reads out.
import { useCallback, useRef, useState, type KeyboardEvent } from 'react';

export function usePointNavigation(count: number) {
  const [active, setActive] = useState<number | null>(null);
  const elements = useRef<(SVGElement | null)[]>([]);

  const focusAt = useCallback(
    (index: number) => {
      if (count === 0) return;
      const clamped = Math.min(count - 1, Math.max(0, index));
      elements.current[clamped]?.focus();
    },
    [count],
  );

  const pointProps = (index: number) => ({
    ref: (element: SVGElement | null) => {
      elements.current[index] = element;
    },
    tabIndex: index === (active !== null && active < count ? active : 0) ? 0 : -1,
    onFocus: () => setActive(index),
    onMouseEnter: () => setActive(index),
    onKeyDown: (event: KeyboardEvent) => {
      const moves: Record<string, number> = {
        ArrowRight: index + 1,
        ArrowUp: index + 1,
        ArrowLeft: index - 1,
        ArrowDown: index - 1,
        Home: 0,
        End: count - 1,
      };
      if (event.key in moves) {
        event.preventDefault();
        focusAt(moves[event.key]);
      }
    },
  });

  return { active: active !== null && active < count ? active : null, pointProps };
}
