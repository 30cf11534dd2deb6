import { fireEvent, screen } from '@testing-library/react';
import { Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { FinishingSystemDto } from '../../shared/schemas/finishing-admin';
import { SystemEditorPage } from '../../src/features/finishing/routes/system-editor';
import { DEMO_CATALOG } from '../fixtures/catalog';
import { SETTINGS } from './estimates-fixtures';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const OWNER = { user: { id: 1, email: 'owner@example.com', name: 'Orla Wendle', role: 'owner', active: true, lastLoginAt: null, createdAt: '2026-01-01T00:00:00Z' } };
const preset = DEMO_CATALOG.systems.find((s) => s.key === 'full-repolish')!;
const SYSTEM: FinishingSystemDto = {
  id: 3, key: preset.key, name: 'Full repolish', description: 'Strip, fill, body, spirit off', stages: preset.stages, preset: true, archived: false, updatedAt: '2026-12-01T09:00:00Z',
};

function open(gallon: 'us' | 'uk') {
  vi.stubGlobal('fetch', fakeFetch({
    '/api/auth/session': () => json(OWNER),
    '/api/finishing-systems/3': () => json(SYSTEM),
    '/api/workshop': () => json({ id: 1, name: 'Test workshop', settings: { ...SETTINGS, shellac: { ...SETTINGS.shellac, gallon } } }),
    '/api/price-list/materials': () => json({ rows: [], total: 0, page: 1, pageSize: 100 }),
  }).fn);
  renderWithApp(
    <Routes>
      <Route path="/finishing/systems/:systemId" element={<SystemEditorPage />} />
    </Routes>,
    { route: '/finishing/systems/3' },
  );
}

describe('the finishing-system editor names the workshop\u2019s gallon beside every cut', () => {
  it.each([
    ['us', 'US gal'],
    ['uk', 'imperial gal'],
  ] as const)('gallon setting %s: the stage summary and the cut field say "%s"', async (gallon, name) => {
    open(gallon);
    const body = await screen.findByRole('button', { name: 'Bodying with the rubber' });
    // The summary line beside the stage (the workshop is read after the system: wait for its gallon).
    expect(await screen.findByText(new RegExp(`1\\.5 lb cut per ${name}`))).toBeTruthy();
    expect(screen.queryByText(new RegExp(`lb cut per ${gallon === 'us' ? 'imperial' : 'US'} gal`))).toBeNull();
    fireEvent.click(body);
    const field = screen.getByLabelText(`Shellac cut (lb per ${name})`) as HTMLInputElement;
    expect(field.value).toBe('1.5');
  });
});
