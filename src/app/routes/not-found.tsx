import { ButtonLink } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { useDocumentTitle } from '@/lib/use-document-title';

export function NotFoundRoute() {
  useDocumentTitle('Page not found');
  return (
    <EmptyState title="Page not found" action={<ButtonLink to="/">Go to your shops</ButtonLink>}>
      There is no page at this address. It may have moved, or the link may be mistyped.
    </EmptyState>
  );
}
