// @vitest-environment jsdom
import '@testing-library/jest-dom/vitest';
import { cleanup, fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { defineRulesFor } from '@shared/auth/ability';
import { renderApp, type Answers } from '../../helpers/render-app';

vi.mock('@/lib/browser', () => ({ assignLocation: vi.fn() }));

const north = { id: '6f1c2a9e-3b7d-4c1e-9a2f-1b2c3d4e5f60', name: 'North Quay Bench', city: 'Halifax', timeZone: 'America/Halifax' };
const south = { id: '7a2d3b8f-4c6e-4d2f-8b3a-2c3d4e5f6a71', name: 'South Mill Woodwinds', city: 'Winnipeg', timeZone: 'America/Winnipeg' };

function me(memberships: Array<{ shopId: string | null; role: 'owner' | 'technician' | 'front_desk' }>, shops = [north, south]) {
  return {
    status: 200,
    body: {
      user: { id: 'user-1', email: 'wren@example.test', name: 'Wren Okafor' },
      network: { id: 'net-1', name: 'Tidewater Band Repair' },
      memberships: memberships.map((m) => ({ ...m, shopName: shops.find((s) => s.id === m.shopId)?.name ?? null })),
      shops,
      // the real rule set, as /api/me sends it
      rules: defineRulesFor({ id: 'user-1', memberships }),
    },
  };
}

const summary = { status: 200, body: { shops: [] } };

beforeEach(() => window.localStorage.clear());
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

describe('what a person may do at each shop', () => {
  it('a technician at one shop and front desk at another sees different actions at each', async () => {
    renderApp(`/?shop=${north.id}`, {
      'GET /api/me': me([{ shopId: north.id, role: 'technician' }, { shopId: south.id, role: 'front_desk' }]),
      'GET /api/shops/summary': summary,
    });
    const atNorth = await screen.findByRole('list', { name: `Allowed at ${north.name}` });
    expect(within(atNorth).getByText('Move jobs through the bench stages')).toBeInTheDocument();
    expect(within(atNorth).queryByText('Open jobs and write estimates')).not.toBeInTheDocument();
    expect(within(atNorth).queryByText('Request transfers to other shops')).not.toBeInTheDocument();

    fireEvent.change(screen.getByRole('combobox', { name: 'Shop' }), { target: { value: south.id } });
    const atSouth = await screen.findByRole('list', { name: `Allowed at ${south.name}` });
    expect(within(atSouth).getByText('Open jobs and write estimates')).toBeInTheDocument();
    expect(within(atSouth).getByText('Request transfers to other shops')).toBeInTheDocument();
    expect(within(atSouth).queryByText('Approve transfers')).not.toBeInTheDocument();
  });
});

describe('inviting someone', () => {
  const answers = (onInvite: Answers[string]): Answers => ({
    'GET /api/me': me([{ shopId: null, role: 'owner' }]),
    'POST /api/invitations': onInvite,
  });

  it('shows field errors from the shared schema without sending anything', async () => {
    const { sent } = renderApp('/people/invite', answers({ status: 201, body: {} }));
    fireEvent.click(await screen.findByRole('button', { name: 'Send invitation' }));
    expect(await screen.findByText('Enter a valid e-mail address.')).toBeInTheDocument();
    expect(screen.getByLabelText('E-mail address')).toHaveAttribute('aria-invalid', 'true');
    expect(sent.filter((r) => r.method === 'POST')).toHaveLength(0);
  });

  it('sends the e-mail with a role per shop and says the mail went out', async () => {
    const { sent } = renderApp(
      '/people/invite',
      answers({ status: 201, body: { invitation: { id: 'inv-1' }, mailed: true } }),
    );
    fireEvent.change(await screen.findByLabelText('E-mail address'), { target: { value: ' New.Person@Example.test ' } });
    fireEvent.change(screen.getByLabelText('Shop 1'), { target: { value: north.id } });
    fireEvent.change(screen.getByLabelText('Role at shop 1'), { target: { value: 'technician' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add another shop' }));
    fireEvent.change(screen.getByLabelText('Shop 2'), { target: { value: south.id } });
    fireEvent.change(screen.getByLabelText('Role at shop 2'), { target: { value: 'front_desk' } });
    fireEvent.click(screen.getByRole('button', { name: 'Send invitation' }));
    expect(await screen.findByText(/Invitation sent to new.person@example.test/)).toBeInTheDocument();
    expect(sent.find((r) => r.method === 'POST')?.body).toEqual({
      email: 'new.person@example.test',
      roles: [
        { shopId: north.id, role: 'technician' },
        { shopId: south.id, role: 'front_desk' },
      ],
    });
  });

  it('shows the server’s refusal on the field it names', async () => {
    renderApp(
      '/people/invite',
      answers({ status: 409, body: { error: { code: 'conflict', message: 'Ada is already a member.', fields: { email: 'Already a member of this network.' } } } }),
    );
    fireEvent.change(await screen.findByLabelText('E-mail address'), { target: { value: 'ada@example.test' } });
    fireEvent.click(screen.getByRole('button', { name: 'Send invitation' }));
    expect(await screen.findByText('Already a member of this network.')).toBeInTheDocument();
    expect(screen.getByRole('alert')).toHaveTextContent('Ada is already a member.');
  });
});

describe('an invitation link', () => {
  const token = 'a'.repeat(43);
  const preview = {
    status: 200,
    body: {
      invitation: {
        email: 'lena@example.test', networkName: 'Tidewater Band Repair', invitedByName: 'Wren Okafor',
        roles: [{ shopName: north.name, role: 'technician' }], status: 'pending', expiresAt: '2030-01-01T00:00:00Z',
      },
    },
  };

  it('explains the invitation and sends the person through sign-in to accept it', async () => {
    renderApp(`/invitations/${token}`, { [`GET /api/invitations/preview/${token}`]: preview });
    expect(await screen.findByRole('heading', { name: 'Join Tidewater Band Repair' })).toBeInTheDocument();
    expect(screen.getByText(`Technician at ${north.name}`)).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Sign in to accept' })).toHaveAttribute(
      'href',
      `/auth/login?returnTo=${encodeURIComponent(`/invitations/${token}/accept`)}`,
    );
  });

  it('accepts once after sign-in and opens the app', async () => {
    let accepted = 0;
    const { router, sent } = renderApp(`/invitations/${token}/accept`, {
      'POST /api/invitations/accept': () => {
        accepted++;
        return { status: 200, body: { accepted: true } };
      },
      'GET /api/me': me([{ shopId: north.id, role: 'technician' }]),
      'GET /api/shops/summary': summary,
    });
    await waitFor(() => expect(router.state.location.pathname).toBe('/'));
    expect(await screen.findByRole('heading', { name: 'Your shops' })).toBeInTheDocument();
    expect(accepted).toBe(1);
    expect(sent.find((r) => r.method === 'POST')?.body).toEqual({ token });
  });

  it('says why a used or expired link is refused', async () => {
    renderApp(`/invitations/${token}/accept`, {
      'POST /api/invitations/accept': { status: 410, body: { error: { code: 'invitation_expired', message: 'This invitation has expired. Ask the owner to send it again.' } } },
    });
    expect(await screen.findByRole('heading', { name: 'The invitation was not accepted' })).toBeInTheDocument();
    expect(screen.getByRole('alert')).toHaveTextContent('This invitation has expired');
  });
});

describe('the audit log screen', () => {
  const personId = '0b7e1f4a-2c3d-4e5f-8a9b-0c1d2e3f4a5b';
  const membershipUpdate = {
    id: 'e1', subject: `Ines Barros at ${north.name}`, at: '2026-03-09T17:05:00.000Z',
    actor: { id: 'user-1', name: 'Wren Okafor', email: 'wren@example.test' },
    action: 'membership.updated', entity: 'Membership', entityId: 'm1',
    before: { id: 'm1', userId: personId, shopId: north.id, role: 'technician' },
    after: { id: 'm1', userId: personId, shopId: north.id, role: 'front_desk' },
  };
  const invitation = {
    id: 'e2', subject: 'juno@example.test', at: '2026-03-08T09:00:00.000Z',
    actor: { id: 'user-1', name: 'Wren Okafor', email: 'wren@example.test' },
    action: 'invitation.created', entity: 'Invitation', entityId: 'i1', before: null,
    after: { id: 'i1', email: 'juno@example.test', roles: [{ shopId: north.id, role: 'technician' }, { shopId: south.id, role: 'front_desk' }] },
  };
  const names = { [personId]: 'Ines Barros', [north.id]: north.name, [south.id]: south.name };

  it('reads in words: names for ids, roles as labels, and says which time zone its times are in', async () => {
    renderApp('/audit-log', {
      'GET /api/me': me([{ shopId: null, role: 'owner' }]),
      'GET /api/people': { status: 200, body: { people: [] } },
      'GET /api/audit-log': { status: 200, body: { entries: [membershipUpdate, invitation], names, nextCursor: null } },
    });
    const list = await screen.findAllByRole('list', { name: 'Changes' }, { timeout: 8000 });
    const text = list.map((l) => l.textContent).join('\n');
    expect(text).toContain('Role: Technician → Front desk');
    expect(text).toContain(`Roles: Technician at ${north.name}; Front desk at ${south.name}`);
    expect(text).not.toMatch(/[0-9a-f]{8}-[0-9a-f]{4}-/);
    expect(text).not.toContain('{');
    expect(screen.getByText(/Times are in your time zone \(/)).toBeInTheDocument();
  });

  it('sends the filters to the server: person, shop, kind and the viewer’s days', async () => {
    const { sent } = renderApp('/audit-log', {
      'GET /api/me': me([{ shopId: null, role: 'owner' }]),
      'GET /api/people': { status: 200, body: { people: [{ id: personId, name: 'Ines Barros', email: 'ines@example.test', active: true, deactivatedAt: null, lastSignInAt: null, createdAt: '2026-01-01T00:00:00Z', memberships: [] }] } },
      'GET /api/audit-log': { status: 200, body: { entries: [membershipUpdate], names, nextCursor: null } },
    });
    await screen.findAllByRole('list', { name: 'Changes' }, { timeout: 8000 });
    await screen.findByRole('option', { name: 'Ines Barros' }, { timeout: 8000 });
    const form = within(screen.getByRole('search', { name: 'Filter the log' }));
    fireEvent.change(form.getByRole('combobox', { name: 'Person' }), { target: { value: personId } });
    fireEvent.change(form.getByRole('combobox', { name: 'Shop' }), { target: { value: north.id } });
    fireEvent.change(form.getByRole('combobox', { name: 'Kind of change' }), { target: { value: 'action:membership.updated' } });
    fireEvent.change(form.getByLabelText('From (day)'), { target: { value: '2026-03-09' } });
    fireEvent.change(form.getByLabelText('To (day, included)'), { target: { value: '2026-03-09' } });
    await waitFor(() => {
      const last = sent.filter((r) => r.path === '/api/audit-log').at(-1)!;
      const q = new URLSearchParams(last.search);
      expect(q.get('personId')).toBe(personId);
      expect(q.get('shopId')).toBe(north.id);
      expect(q.get('action')).toBe('membership.updated');
      // one whole local day: from that midnight to the next one
      expect(Date.parse(q.get('to')!) - Date.parse(q.get('from')!)).toBe(new Date(2026, 2, 10).getTime() - new Date(2026, 2, 9).getTime());
      expect(new Date(q.get('from')!).getHours()).toBe(0);
    });
  });
});
