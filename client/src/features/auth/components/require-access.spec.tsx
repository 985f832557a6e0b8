import { screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { renderRoutes } from '../../../test/render';
import { RequireAccess } from './require-access';

const routes = [
  { path: '/sign-in', element: <p>sign-in page</p> },
  { path: '/admin', element: <RequireAccess capability="users"><p>user admin</p></RequireAccess> },
];

describe('RequireAccess', () => {
  afterEach(() => sessionStore.set(null));

  it('sends a visitor to sign in, remembering where they were going', () => {
    const { router } = renderRoutes(routes, '/admin');
    expect(screen.getByText('sign-in page')).toBeInTheDocument();
    expect(router.state.location.state).toEqual({ from: '/admin' });
  });

  it('refuses a role without the capability', () => {
    sessionStore.set({ accessToken: 't', user: { id: 2, email: 'f@x.test', name: 'F', role: 'frontdesk' } });
    renderRoutes(routes, '/admin');
    expect(screen.getByText('Not available for your role')).toBeInTheDocument();
    expect(screen.queryByText('user admin')).toBeNull();
  });

  it('lets the admin through', () => {
    sessionStore.set({ accessToken: 't', user: { id: 1, email: 'a@x.test', name: 'A', role: 'admin' } });
    renderRoutes(routes, '/admin');
    expect(screen.getByText('user admin')).toBeInTheDocument();
  });
});
