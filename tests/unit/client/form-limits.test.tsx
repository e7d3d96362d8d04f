// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, render, screen } from '@testing-library/react';
import { useState } from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { timeLogSchema, lineItemCreateSchema } from '@shared/jobs/schemas';
import { Field } from '@/components/ui/form-controls';
import { TextAreaField } from '@/features/registry/components/fields';
import { amountProblem } from '@/features/jobs/format';

afterEach(cleanup);

function Note() {
  const [note, setNote] = useState('');
  return (
    <Field label="Note">
      <textarea value={note} onChange={(e) => setNote(e.target.value)} maxLength={500} />
    </Field>
  );
}

describe('long text shows its limit before submit', () => {
  it('a shared field counts as one types, and the screen reader hears it with the field', () => {
    render(<Note />);
    const box = screen.getByLabelText('Note');
    expect(screen.getByText('0 / 500')).toBeInTheDocument();
    fireEvent.change(box, { target: { value: 'Low B pad torn; check the octave key.' } });
    const counter = screen.getByText('37 / 500');
    expect(box.getAttribute('aria-describedby')).toContain(counter.parentElement!.id);
  });

  it('the registry’s text area counts too; short codes get no counter', () => {
    render(
      <>
        <TextAreaField label="What the customer reports" value="Sticky G♯" onChange={() => {}} maxLength={2000} />
        <Field label="Code">
          <input value="PDX" onChange={() => {}} maxLength={8} />
        </Field>
      </>,
    );
    expect(screen.getByText('9 / 2000')).toBeInTheDocument();
    expect(screen.queryByText('3 / 8')).not.toBeInTheDocument();
  });
});

describe('number boxes say “Enter a number” for words', () => {
  it('typed amounts: letters first, then decimals', () => {
    expect(amountProblem('two')).toBe('Enter a number, e.g. 1.25.');
    expect(amountProblem('1.5h')).toBe('Enter a number, e.g. 1.25.');
    expect(amountProblem('1.255')).toBe('At most two decimals, e.g. 1.25.');
    expect(amountProblem('1.25')).toBeUndefined();
    expect(amountProblem('')).toBeUndefined();
  });

  it('the shared schemas say it the same way to the server’s callers', () => {
    const minutes = timeLogSchema.safeParse({ minutes: 'ten' });
    expect(minutes.success).toBe(false);
    expect(minutes.error!.issues[0].message).toBe('Enter a number of minutes.');
    const line = lineItemCreateSchema.safeParse({ kind: 'part', description: 'Cork sheet', quantity: 'two', unitPriceCents: 100 });
    expect(line.success).toBe(false);
    expect(line.error!.issues.find((i) => i.path.join('.') === 'quantity')?.message).toMatch(/^Enter a number/);
  });
});
