import '@fontsource/lora/400.css';
import '@fontsource/lora/600.css';
import '@fontsource/lora/700.css';
import './index.css';
import '@shared/schemas/error-map';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import { AppProvider } from './app/provider';
import { createRouter } from './app/router';
import { createQueryClient } from './lib/query-client';

const queryClient = createQueryClient();
const router = createRouter();

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  </StrictMode>,
);
