import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import '@fontsource/atkinson-hyperlegible/400.css';
import '@fontsource/atkinson-hyperlegible/700.css';
import './index.css';
import { AppProviders } from './app/providers';
import { router } from './app/router';
import { UpdatePrompt } from './features/sync/components/update-prompt';

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProviders>
      <RouterProvider router={router} />
      <UpdatePrompt />
    </AppProviders>
  </StrictMode>,
);
