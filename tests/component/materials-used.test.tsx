/**
 * Marking a session done shows the materials the estimate expects for it, in packs, and sends what the polisher
 * leaves or changes; a negative number of packs is refused by the form before anything is sent.
 */
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { SessionMaterialLine } from '../../shared/schemas/stock';
import { MarkDoneDialog } from '../../src/features/planning/components/mark-done-dialog';
import { fakeFetch, json, renderWithApp } from './render';

afterEach(() => vi.unstubAllGlobals());

const PREFILL: SessionMaterialLine[] = [
  { materialId: 4, key: 'shellac-blonde', name: 'Shellac flakes, blonde', unit: 'g', estimated: 125, packId: 40, packs: 0.5, options: [{ packId: 40, size: 250, label: '250 g bag' }, { packId: 41, size: 1000, label: '1 kg bag' }] },
  { materialId: 7, key: 'spirit', name: 'Finishing spirit', unit: 'mL', estimated: 600, packId: 70, packs: 0.6, options: [{ packId: 70, size: 1000, label: '1 L tin' }] },
];

function renderDialog() {
  const bodies: unknown[] = [];
  const net = fakeFetch({
    '/api/auth/csrf': () => json({ csrfToken: 't' }),
    '/api/jobs/12/sessions/99/materials': () => json(PREFILL),
    '/api/jobs/12/sessions/99/done': (init) => {
      bodies.push(JSON.parse(String(init?.body)));
      return json({ job: { id: 12, number: 'JOB-2026-0012', state: 'in-progress', sessionsDone: 1, sessionsTotal: 6 }, shift: null });
    },
  });
  vi.stubGlobal('fetch', net.fn);
  renderWithApp(
    <MarkDoneDialog
      session={{ jobId: 12, jobNumber: 'JOB-2026-0012', sessionId: 99, label: 'Bodying 1 of 3', end: '2026-01-05T12:00', handsOnHours: 2 }}
      climate={{ temperatureC: 20, humidityPct: 55 }}
      unit="bays"
      onClose={() => {}}
    />,
  );
  return bodies;
}

describe('materials used in a session', () => {
  it('is prefilled in packs from the estimate and sends the polisher\u2019s changes', async () => {
    const bodies = renderDialog();
    const flakes = (await screen.findByLabelText('Packs of Shellac flakes, blonde used')) as HTMLInputElement;
    expect(flakes.value).toBe('0.5');
    expect(screen.getByText('estimate 125 g')).toBeTruthy();
    fireEvent.change(flakes, { target: { value: '0.25' } });
    fireEvent.change(screen.getByLabelText('Pack of Shellac flakes, blonde'), { target: { value: '41' } });
    fireEvent.change(screen.getByLabelText(/^Notes/), { target: { value: 'Two rubbers of 1 lb cut' } });
    fireEvent.click(screen.getByRole('button', { name: /Mark done/ }));
    await waitFor(() => expect(bodies).toHaveLength(1));
    expect((bodies[0] as { materials: unknown }).materials).toEqual([
      { materialId: 4, packId: 41, packs: 0.25 },
      { materialId: 7, packId: 70, packs: 0.6 },
    ]);
  });

  it('refuses a negative number of packs before sending, naming the material', async () => {
    const bodies = renderDialog();
    const spirit = await screen.findByLabelText('Packs of Finishing spirit used');
    fireEvent.change(spirit, { target: { value: '-1' } });
    fireEvent.change(screen.getByLabelText(/^Notes/), { target: { value: 'ok' } });
    fireEvent.click(screen.getByRole('button', { name: /Mark done/ }));
    expect((await screen.findByText(/Finishing spirit: must be 0 or more/)).textContent).toContain('Finishing spirit');
    expect(bodies).toHaveLength(0);
  });
});
