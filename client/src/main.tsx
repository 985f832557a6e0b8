import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import { AppProvider, SessionGate } from './app/provider';
import { createRouter } from './app/router';

const router = createRouter();

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider>
      <SessionGate>
        <RouterProvider router={router} />
      </SessionGate>
    </AppProvider>
  </StrictMode>,
);
