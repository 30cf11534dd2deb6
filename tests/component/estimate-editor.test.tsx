import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { EstimateEditor, type SavePayload } from '../../src/features/estimates/components/estimate-editor';
import { newDraft } from '../../src/features/estimates/lib/draft';
import { CALC, ME, PIECE } from './estimates-fixtures';
import { fakeFetch, json, renderWithApp } from './render';

// The calendar chart is loaded lazily (recharts is large). Loaded once here, before any test, no test pays for the
// import at whatever moment it happens to finish, and each test renders the same way.
beforeAll(async () => {
  await import('../../src/features/estimates/components/calendar-chart');
});

beforeEach(() => {
  window.localStorage.clear();
  vi.stubGlobal('fetch', fakeFetch({ '/api/auth/session': () => json(ME) }).fn);
});
afterEach(() => vi.unstubAllGlobals());

function renderEditor(onSave: (p: SavePayload) => void = () => {}) {
  const initial = { ...newDraft(PIECE, CALC.catalog, CALC.settings), startDate: '2026-03-02' };
  return renderWithApp(<EstimateEditor calc={CALC} pieceKind="grand" initial={initial} saveLabel="Save estimate" onSave={onSave} today="2026-03-02" />);
}

/**
 * Direct DOM look-ups by accessible name. Role and label queries over the whole editor (over a thousand elements,
 * two thousand with the parts table) take seconds each in jsdom; these find the same controls by the same names:
 * a label's exact text and the control it is for, an aria-label, or a button's own words.
 */
function labelled(name: string, scope: ParentNode = document): HTMLInputElement {
  for (const label of scope.querySelectorAll('label')) {
    if (label.textContent?.trim() === name && label.htmlFor) {
      const control = document.getElementById(label.htmlFor);
      if (control) return control as HTMLInputElement;
    }
  }
  for (const el of scope.querySelectorAll<HTMLElement>('[aria-label]')) if (el.getAttribute('aria-label') === name) return el as HTMLInputElement;
  throw new Error(`Nothing is labelled "${name}"`);
}

function button(name: string | RegExp, scope: ParentNode = document): HTMLButtonElement {
  for (const b of scope.querySelectorAll('button')) {
    const text = b.getAttribute('aria-label') ?? b.textContent?.trim() ?? '';
    if (typeof name === 'string' ? text === name : name.test(text)) return b;
  }
  throw new Error(`No button "${String(name)}"`);
}

function heading(name: string): HTMLElement {
  for (const h of document.querySelectorAll<HTMLElement>('h1, h2, h3, h4')) if (h.textContent?.trim() === name) return h;
  throw new Error(`No heading "${name}"`);
}

const text = (testId: string) => screen.getByTestId(testId).textContent ?? '';
const areaValue = (s: string) => Number(s.replace(/[^\d.]/g, ''));

describe('EstimateEditor', () => {
  it('prices the piece at once, every figure with its unit', async () => {
    renderEditor();
    expect(text('total-area')).toMatch(/^\d+(\.\d+)? m²$/);
    expect(text('total-coats')).toMatch(/^\d+ coats$/);
    expect(text('total-hours')).toMatch(/^\d+(\.\d)? h$/);
    expect(text('total-flakes')).toMatch(/^\d+(\.\d+)? (g|kg)$/);
    expect(text('total-spirit')).toMatch(/^\d+(\.\d+)? (mL|L)$/);
    expect(text('total-days')).toMatch(/^\d+ days?$/);
    expect(text('total-price')).toMatch(/^£[\d,]+\.\d{2}$/);
    // The cautions and the ventilation figure come with every estimate.
    expect(heading('Safety cautions')).toBeTruthy();
    expect(text('ventilation')).toMatch(/m³\/h/);
    // Area per part, per-stage figures and packs show their units too.
    expect(within(screen.getByTestId('part-area-lid-top')).getAllByText(/m²$/).length).toBeGreaterThan(0);
    expect(within(screen.getByTestId('stage-body')).getAllByText(/^\d+(\.\d)? h$/).length).toBeGreaterThan(0);
    expect(within(screen.getByTestId('material-shellac-flakes')).getAllByText(/× \d+ g @ £/).length).toBeGreaterThan(0);
  });

  it('typing a dimension updates the area shown', async () => {
    renderEditor();
    const before = areaValue(text('total-area'));
    fireEvent.change(labelled('Length'), { target: { value: '6 ft 3 in' } });
    expect(screen.getByText('read as 1905 mm (75.0 in)')).toBeTruthy();
    fireEvent.change(labelled('Length'), { target: { value: '250 cm' } });
    await waitFor(() => expect(areaValue(text('total-area'))).toBeGreaterThan(before));
    expect(text('piece-area')).toBe(text('total-area'));
  });

  it('a bad length shows the message beside the field and keeps the last figures, marked out of date', async () => {
    renderEditor();
    const price = text('total-price');
    const length = labelled('Length');
    fireEvent.change(length, { target: { value: '190 furlongs' } });
    await waitFor(() => expect(length.getAttribute('aria-invalid')).toBe('true'));
    const message = document.getElementById(length.getAttribute('aria-describedby')!)!;
    expect(message.textContent).toMatch(/"furlongs" is not a length unit/);
    expect(message.getAttribute('role')).toBe('alert');
    expect(screen.getByTestId('stale').textContent).toMatch(/Out of date/);
    expect(text('total-price')).toBe(price);
    fireEvent.change(length, { target: { value: '200 cm' } });
    await waitFor(() => expect(screen.queryByTestId('stale')).toBeNull());
    expect(length.getAttribute('aria-invalid')).toBeNull();
  });

  it('switches to imperial display and remembers the choice', async () => {
    const first = renderEditor();
    fireEvent.click(button(/Imperial/));
    expect(text('total-area')).toMatch(/ft²$/);
    expect(text('total-flakes')).toMatch(/(oz|lb)$/);
    first.unmount();
    renderEditor();
    await waitFor(() => expect(text('total-area')).toMatch(/ft²$/));
  });

  /** Part rows by their accessible name (querying the DOM directly: role queries over the whole page are slow in jsdom). */
  const rows = () => [...document.querySelectorAll<HTMLElement>('li[aria-label^="Part "]')];
  const row = (name: RegExp) => rows().find((r) => name.test(r.getAttribute('aria-label') ?? ''))!;

  it('edits the generated parts table: a count changes that part’s area, a bad count is named beside the field', async () => {
    renderEditor();
    fireEvent.click(button('Edit the parts table'));
    const legs = row(/^Part \d+: Legs$/);
    const area = within(legs).getByTestId(/row-area-/);
    const before = areaValue(area.textContent ?? '');
    fireEvent.change(labelled('Count of Legs', legs), { target: { value: '6' } });
    await waitFor(() => expect(areaValue(area.textContent ?? '')).toBeCloseTo(before * 2, 2));
    fireEvent.change(labelled('Count of Legs', legs), { target: { value: 'three' } });
    await waitFor(() => expect(within(legs).getByRole('alert').textContent).toMatch(/whole number/));
    expect(screen.getByTestId('stale')).toBeTruthy();
  }, 30_000);

  it('adds, duplicates and removes parts', async () => {
    renderEditor();
    fireEvent.click(button('Edit the parts table'));
    const start = rows().length;
    fireEvent.click(labelled('Duplicate Lyre', row(/: Lyre$/)));
    expect(rows().length).toBe(start + 1);
    expect(row(/Lyre \(copy\)/)).toBeTruthy();
    fireEvent.click(within(row(/Lyre \(copy\)/)).getByLabelText('Remove Lyre (copy)'));
    expect(rows().length).toBe(start);
    fireEvent.click(screen.getByText('Add a part'));
    expect(rows().length).toBe(start + 1);
    const added = row(/New part/);
    fireEvent.change(labelled('Length of New part', added), { target: { value: '50 cm' } });
    fireEvent.change(labelled('Width of New part', added), { target: { value: '40 cm' } });
    await waitFor(() => expect(within(added).getByTestId(/row-area-/).textContent).toBe('0.20 m²'));
  }, 30_000);

  it('saves the inputs only: the server works out the figures again', async () => {
    const onSave = vi.fn();
    renderEditor(onSave);
    fireEvent.change(labelled('Length'), { target: { value: '195 cm' } });
    fireEvent.change(labelled('Sessions of Bodying with the rubber'), { target: { value: '8' } });
    fireEvent.click(button('Save estimate'));
    expect(onSave).toHaveBeenCalledTimes(1);
    const payload = onSave.mock.calls[0]![0] as SavePayload;
    expect(payload.input.piece).toMatchObject({ template: 'grand', dimensions: { length: '195 cm' } });
    expect(payload.input.stages?.find((s) => s.key === 'body')?.sessions).toBe(8);
    expect(JSON.stringify(payload)).not.toMatch(/"totals"|"price"/);
    expect(payload.title).toBe(PIECE.description);
  });

  it('refuses to save while a field is wrong, and says why', async () => {
    const onSave = vi.fn();
    renderEditor(onSave);
    fireEvent.change(labelled('Relative humidity'), { target: { value: '140' } });
    await waitFor(() => expect(labelled('Relative humidity').getAttribute('aria-invalid')).toBe('true'));
    fireEvent.click(button('Save estimate'));
    expect(onSave).not.toHaveBeenCalled();
    expect(screen.getByText(/Fix the fields marked ▲ first/)).toBeTruthy();
  });
});

describe('EstimateEditor keeps unsaved work in the browser', () => {
  const renderKept = () => {
    const initial = { ...newDraft(PIECE, CALC.catalog, CALC.settings), startDate: '2026-03-02' };
    return renderWithApp(<EstimateEditor calc={CALC} pieceKind="grand" initial={initial} saveLabel="Save estimate" onSave={() => {}} today="2026-03-02" draftKey="new-estimate:piece:1" />);
  };

  it('offers what was typed again after the page is closed, and restores it on request', async () => {
    const first = renderKept();
    expect(screen.queryByText('Unsaved work on this device')).toBeNull();
    fireEvent.change(labelled('Length'), { target: { value: '250 cm' } });
    await waitFor(() => expect(window.localStorage.getItem('shellwright:draft:new-estimate:piece:1')).toContain('250 cm'));
    first.unmount();

    renderKept();
    expect(await screen.findByText('Unsaved work on this device')).toBeTruthy();
    expect((labelled('Length') as HTMLInputElement).value).not.toBe('250 cm');
    fireEvent.click(button('Restore my unsaved work'));
    await waitFor(() => expect((labelled('Length') as HTMLInputElement).value).toBe('250 cm'));
    expect(screen.queryByText('Unsaved work on this device')).toBeNull();
  });

  it('discarding forgets the draft, and an unchanged form keeps nothing', async () => {
    const first = renderKept();
    fireEvent.change(labelled('Length'), { target: { value: '250 cm' } });
    await waitFor(() => expect(window.localStorage.getItem('shellwright:draft:new-estimate:piece:1')).not.toBeNull());
    first.unmount();
    const second = renderKept();
    fireEvent.click(await waitFor(() => button('Discard it')));
    expect(window.localStorage.getItem('shellwright:draft:new-estimate:piece:1')).toBeNull();
    second.unmount();
    renderKept();
    expect(screen.queryByText('Unsaved work on this device')).toBeNull();
  });

  it('says so when the connection drops', async () => {
    renderKept();
    const online = vi.spyOn(navigator, 'onLine', 'get').mockReturnValue(false);
    window.dispatchEvent(new Event('offline'));
    expect(await screen.findByText('No connection')).toBeTruthy();
    online.mockRestore();
    window.dispatchEvent(new Event('online'));
    await waitFor(() => expect(screen.queryByText('No connection')).toBeNull());
  });
});
