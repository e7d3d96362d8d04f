// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, render, screen } from '@testing-library/react';
import { MemoryRouter } from 'react-router-dom';
import { afterEach, describe, expect, it } from 'vitest';
import type { JobSummary } from '@shared/jobs/dto';
import { JobList } from '@/features/jobs/components/job-list';

/** A private customer of another shop comes as `customerName: null, customerHidden: true`: the card says so. */
describe('job cards and customers whose name is kept by another shop', () => {
  afterEach(cleanup);
  const job = (over: Partial<JobSummary>): JobSummary => ({
    id: `job-${over.number}`, number: over.number ?? 1, stage: 'on_bench', stageBeforeHold: null,
    shop: { id: 'den', name: 'Denver bench', timeZone: 'America/Denver' },
    instrument: { id: 'i', family: 'flute', maker: 'Quellstone', model: null, serial: `Q ${over.number}`, heavyCase: false },
    customerName: null, customerHidden: false, complaint: 'Low C does not speak', assignee: null, requiredSkill: null,
    promisedOn: null, overdue: false, estimateApproved: false, openedAt: '2026-11-01T00:00:00.000Z', updatedAt: '2026-11-01T00:00:00.000Z',
    ...over,
  });

  it('writes "Private customer" for a hidden name, the name when shown, and nothing for no customer', () => {
    render(
      <MemoryRouter>
        <JobList
          label="Jobs"
          linkTo={(j) => `/jobs/${j.id}`}
          jobs={[job({ number: 1, customerHidden: true }), job({ number: 2, customerName: 'Thornbury Academy Band' }), job({ number: 3 })]}
        />
      </MemoryRouter>,
    );
    expect(screen.getByText(/Q 1/).closest('p')).toHaveTextContent('Serial Q 1 · Private customer');
    expect(screen.getByText(/Q 2/).closest('p')).toHaveTextContent('Serial Q 2 · Thornbury Academy Band');
    expect(screen.getByText(/Q 3/).closest('p')).toHaveTextContent(/^Serial Q 3$/);
  });
});
