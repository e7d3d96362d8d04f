import { useId, useState, type FormEvent } from 'react';
import { invoiceQuerySchema } from '@shared/reports/schemas';
import { csvLinks } from '@shared/reports/links';
import { localDateIn } from '@shared/time/calendar-date';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { downloadFile, DownloadError } from '../download';

interface InvoiceExportProps {
  /** shops whose invoices this person may export */
  shops: Array<{ id: string; name: string }>;
}

const input = 'min-h-11 rounded-lg border border-paper-300 bg-white px-3 text-ink-950 aria-[invalid=true]:border-danger-700';

/**
 * The invoice CSV for the accounting system: released jobs in a date range (by the release date on
 * each shop's calendar), one row per line item with the invoice's subtotal, tax and total repeated.
 */
export function InvoiceExport({ shops }: InvoiceExportProps) {
  const today = localDateIn(new Date(), Intl.DateTimeFormat().resolvedOptions().timeZone);
  // last month and this month so far: the usual span an accountant asks for
  const [from, setFrom] = useState(() => {
    const [y, m] = today.split('-').map(Number);
    return m === 1 ? `${y - 1}-12-01` : `${y}-${String(m - 1).padStart(2, '0')}-01`;
  });
  const [to, setTo] = useState(today);
  const [shop, setShop] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const id = useId();

  async function submit(event: FormEvent) {
    event.preventDefault();
    setMessage(null);
    // the same schema the server parses with, so the person sees the same field errors before sending
    const parsed = invoiceQuerySchema.safeParse({ from, to, shop: shop || undefined });
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) next[String(issue.path[0] ?? '_')] ??= issue.message;
      setFields(next);
      return;
    }
    setFields({});
    setBusy(true);
    try {
      const name = await downloadFile(csvLinks.invoices(from, to, shop || undefined));
      setMessage(`Saved ${name}.`);
    } catch (err) {
      if (err instanceof DownloadError) {
        setFields(err.fields);
        setMessage(err.message);
      } else {
        setMessage('The export could not be downloaded. Check the connection and try again.');
      }
    } finally {
      setBusy(false);
    }
  }

  return (
    <Card as="section" aria-labelledby={`${id}-title`} className="flex flex-col gap-4">
      <div>
        <h2 id={`${id}-title`} className="text-lg font-semibold text-ink-950">Invoices for accounting</h2>
        <p className="mt-1 max-w-prose text-sm text-ink-600">
          Released jobs in a date range, one row per line item: labor hours × rate and parts × unit price, each line
          rounded to the cent; tax on the subtotal at the shop’s rate, rounded half away from zero. Amounts in cents and
          as decimals.
        </p>
      </div>
      <form className="flex flex-col gap-4 sm:flex-row sm:flex-wrap sm:items-end" onSubmit={(event) => void submit(event)} noValidate>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-from`} className="text-sm font-semibold text-ink-800">Released from</label>
          <input
            id={`${id}-from`} type="date" className={input} value={from} onChange={(e) => setFrom(e.target.value)}
            aria-invalid={fields.from ? true : undefined} aria-describedby={fields.from ? `${id}-from-error` : undefined}
          />
          {fields.from ? <p id={`${id}-from-error`} className="text-sm text-danger-700">{fields.from}</p> : null}
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-to`} className="text-sm font-semibold text-ink-800">Released to (inclusive)</label>
          <input
            id={`${id}-to`} type="date" className={input} value={to} onChange={(e) => setTo(e.target.value)}
            aria-invalid={fields.to ? true : undefined} aria-describedby={fields.to ? `${id}-to-error` : undefined}
          />
          {fields.to ? <p id={`${id}-to-error`} className="text-sm text-danger-700">{fields.to}</p> : null}
        </div>
        {shops.length > 1 ? (
          <div className="flex flex-col gap-1">
            <label htmlFor={`${id}-shop`} className="text-sm font-semibold text-ink-800">Shop</label>
            <select id={`${id}-shop`} className={input} value={shop} onChange={(e) => setShop(e.target.value)}>
              <option value="">All shops you may export ({shops.length})</option>
              {shops.map((s) => (
                <option key={s.id} value={s.id}>{s.name}</option>
              ))}
            </select>
          </div>
        ) : null}
        <Button type="submit" disabled={busy}>
          {busy ? 'Preparing…' : 'Download invoice CSV'}
        </Button>
      </form>
      <p role="status" className="text-sm text-ink-800">{message}</p>
    </Card>
  );
}
