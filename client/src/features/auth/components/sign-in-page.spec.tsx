import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it } from 'vitest';
import { sessionStore } from '../../../lib/session';
import { mockFetch, renderRoutes } from '../../../test/render';
import { SignInPage } from './sign-in-page';

const routes = [
  { path: '/sign-in', element: <SignInPage /> },
  { path: '/', element: <p>home page</p> },
];

describe('SignInPage', () => {
  afterEach(() => sessionStore.set(null));

  it('asks for both fields before calling the server', async () => {
    const calls = mockFetch({});
    renderRoutes(routes, '/sign-in');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByText('Enter your e-mail address')).toBeInTheDocument();
    expect(screen.getByText('Enter your password')).toBeInTheDocument();
    expect(calls).toHaveLength(0);
  });

  it("shows the server's refusal", async () => {
    mockFetch({ 'POST /api/auth/login': () => ({ status: 401, body: { statusCode: 401, message: 'The e-mail or password is not right' } }) });
    renderRoutes(routes, '/sign-in');
    await userEvent.type(screen.getByLabelText('E-mail'), 'frontdesk@quillfern-endo.test');
    await userEvent.type(screen.getByLabelText('Password'), 'wrong');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    expect(await screen.findByRole('alert')).toHaveTextContent('The e-mail or password is not right');
    expect(sessionStore.get()).toBeNull();
  });

  it('stores the session and leaves for the app', async () => {
    const calls = mockFetch({
      'POST /api/auth/login': () => ({ status: 200, body: { accessToken: 't', user: { id: 1, email: 'a@b.test', name: 'A', role: 'admin' } } }),
    });
    const { router } = renderRoutes(routes, '/sign-in');
    await userEvent.type(screen.getByLabelText('E-mail'), ' A@b.test ');
    await userEvent.type(screen.getByLabelText('Password'), 'secret-secret');
    await userEvent.click(screen.getByRole('button', { name: 'Sign in' }));
    await waitFor(() => expect(router.state.location.pathname).toBe('/'));
    expect(calls[0].body).toEqual({ email: 'A@b.test', password: 'secret-secret' });
    expect(sessionStore.get()?.user.role).toBe('admin');
  });
});
