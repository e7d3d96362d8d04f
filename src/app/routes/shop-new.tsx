import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { Card } from '@/components/ui/card';
import { PageHeader } from '@/components/ui/page-header';
import { ShopForm } from '@/features/shops/components/shop-form';
import { useCreateShop } from '@/features/shops/mutations';
import { sessionKeys } from '@/features/session/queries';
import { errorMessage, serverFieldErrors } from '@/lib/form-errors';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';

/** `/shops/new` (owner). */
export function NewShopRoute() {
  useDocumentTitle('New shop');
  const create = useCreateShop();
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const { currentShop } = useCurrentShop();
  const [message, setMessage] = useState<{ tone: 'error'; text: string } | null>(null);
  return (
    <>
      <Link to={withShop('/shops', currentShop?.id)} className="inline-flex min-h-11 items-center font-semibold text-accent-700 underline underline-offset-2">
        All shops
      </Link>
      <PageHeader title="New shop" description="Where it is, its clock, when it opens and what an hour at its bench costs." />
      <Card className="max-w-3xl">
        <ShopForm
          submitLabel="Open the shop"
          pending={create.isPending}
          serverErrors={serverFieldErrors(create.error)}
          message={message}
          onSubmit={(input) =>
            create.mutate(input, {
              onSuccess: ({ shop }) => {
                // the new shop belongs in the owner's shop switcher too
                void queryClient.invalidateQueries({ queryKey: sessionKeys.me() });
                void navigate(withShop(`/shops/${shop.id}`, currentShop?.id));
              },
              onError: (e) => setMessage({ tone: 'error', text: errorMessage(e) }),
            })
          }
        />
      </Card>
    </>
  );
}
