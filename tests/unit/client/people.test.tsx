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
