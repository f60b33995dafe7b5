'use client';

import { useEffect, useRef, useState } from 'react';

/**
 * True once the element has come within `margin` of the viewport, and from then on. Charts use
 * it to fetch their drawing code only when someone scrolls to them.
 */
export function useInView<T extends Element>(margin = '300px') {
  const ref = useRef<T>(null);
  const [seen, setSeen] = useState(false);
  useEffect(() => {
    const element = ref.current;
    if (!element || seen) return;
    if (typeof IntersectionObserver === 'undefined') {
      setSeen(true);
      return;
    }
    const observer = new IntersectionObserver(
      (entries) => {
        if (entries.some((e) => e.isIntersecting)) {
          setSeen(true);
          observer.disconnect();
        }
      },
      { rootMargin: margin },
    );
    observer.observe(element);
    return () => observer.disconnect();
  }, [margin, seen]);
  return [ref, seen] as const;
}
