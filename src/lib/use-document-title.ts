import { useEffect } from 'react';

/** Keeps the tab title in step with the screen, so tabs and screen-reader page announcements make sense. */
export function useDocumentTitle(title: string) {
  useEffect(() => {
    document.title = title ? `${title} · Benchrelay` : 'Benchrelay';
  }, [title]);
}
