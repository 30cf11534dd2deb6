/**
 * The sign-up form: the workshop, its money and measures, and the owner's own account. It checks itself with the
 * shared schema first (every field that is wrong says so), then shows what the server says about a field (an
 * address that already has an account). Choosing the country suggests its currency, tax and measures; the owner
 * can change each.
 */
import { useMemo, useState, type FormEvent } from 'react';
import { COUNTRIES, CURRENCY_CODES, countryOf } from '@shared/countries';
import { SignupSchema, type SignupInput, type SignupResult } from '@shared/schemas/signup';
import { DEFAULT_TIME_ZONE, isTimeZone, timeZoneOptions } from '@shared/time';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { SelectField, TextField } from '@/components/field';
import { ApiError } from '@/lib/api';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useSignUp } from '../api/signup';

interface Form {
  workshopName: string;
  country: string;
  currency: string;
  taxLabel: string;
  taxPct: string;
  pricesIncludeTax: boolean;
  units: 'metric' | 'imperial';
  timeZone: string;
  ownerName: string;
  email: string;
  password: string;
  repeat: string;
}

/** What a country suggests (common practice): the tax's usual name, whether shop prices include it, the measures. */
function suggestionsFor(code: string): Pick<Form, 'currency' | 'taxLabel' | 'pricesIncludeTax' | 'units'> | null {
  const country = countryOf(code);
  if (!country) return null;
  const salesTax = code === 'US';
  const gst = ['AU', 'NZ', 'CA', 'SG', 'IN', 'MY'].includes(code);
  return {
    currency: country.currencies[0] ?? '',
    taxLabel: salesTax ? 'Sales tax' : gst ? 'GST' : 'VAT',
    pricesIncludeTax: !(salesTax || code === 'CA'),
    units: ['US', 'LR', 'MM'].includes(code) ? 'imperial' : 'metric',
  };
}

function browserTimeZone(): string {
  try {
    const zone = Intl.DateTimeFormat().resolvedOptions().timeZone;
    return zone && isTimeZone(zone) ? zone : DEFAULT_TIME_ZONE;
  } catch {
    return DEFAULT_TIME_ZONE;
  }
}

const currencyNames = (() => {
  try {
    return new Intl.DisplayNames(['en'], { type: 'currency' });
  } catch {
    return null;
  }
})();

const EMPTY: Form = {
  workshopName: '',
  country: '',
  currency: '',
  taxLabel: 'VAT',
  taxPct: '',
  pricesIncludeTax: true,
  units: 'metric',
  timeZone: DEFAULT_TIME_ZONE,
  ownerName: '',
  email: '',
  password: '',
  repeat: '',
};

/** The body to send: the tax rate as a number (an empty box is "missing", not zero). */
function toInput(form: Form): SignupInput {
  const { repeat: _repeat, taxPct, ...rest } = form;
  return { ...rest, taxPct: taxPct.trim() === '' ? Number.NaN : Number(taxPct.replace(',', '.')) };
}

export function SignupForm({ onDone }: { onDone: (result: SignupResult) => void }) {
  const signUp = useSignUp();
  const [form, setForm] = useState<Form>(() => ({ ...EMPTY, timeZone: browserTimeZone() }));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [failure, setFailure] = useState<string>();
  const zones = useMemo(() => timeZoneOptions(form.timeZone), [form.timeZone]);
  /** A field changed: its old message goes (the form checks again when sent). */
  const clear = (...keys: string[]) =>
    setErrors((e) => (keys.some((k) => k in e) ? Object.fromEntries(Object.entries(e).filter(([k]) => !keys.includes(k))) : e));
  const set = <K extends keyof Form>(key: K, value: Form[K]) => {
    setForm((f) => ({ ...f, [key]: value }));
    clear(key);
  };

  const chooseCountry = (code: string) => {
    const suggested = suggestionsFor(code);
    setForm((f) => ({ ...f, country: code, ...(suggested ?? {}) }));
    clear('country', ...(suggested ? Object.keys(suggested) : []));
  };

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = SignupSchema.safeParse(toInput(form));
    const found = parsed.success ? {} : zodFieldErrors(parsed.error);
    if (form.taxPct.trim() === '') found.taxPct = 'is required';
    if (form.password && form.repeat !== form.password) found.repeat = 'must be the same password again';
    setErrors(found);
    setFailure(undefined);
    if (!parsed.success || Object.keys(found).length > 0) return;
    signUp.mutate(parsed.data, {
      onSuccess: onDone,
      onError: (err) => {
        const fields = serverFieldErrors(err);
        if (Object.keys(fields).length > 0) setErrors(fields);
        else setFailure(err instanceof ApiError ? err.message : 'The sign-up could not be sent. Try again.');
      },
    });
  };

  const countryOptions = [{ value: '', label: 'Choose the country…' }, ...COUNTRIES.map((c) => ({ value: c.code, label: c.name }))];
  const currencyOptions = [
    { value: '', label: 'Choose the currency…' },
    ...CURRENCY_CODES.map((code) => ({ value: code, label: `${code} — ${currencyNames?.of(code) ?? code}` })),
  ];
  const errorCount = Object.keys(errors).length;

  return (
    <form onSubmit={submit} noValidate className="space-y-6" aria-label="Sign up your workshop">
      {failure && (
        <Alert tone="error" title="Not signed up">
          {failure}
        </Alert>
      )}
      {errorCount > 0 && (
        <Alert tone="error" title={errorCount === 1 ? 'One thing to put right' : `${errorCount} things to put right`}>
          The fields marked below say what is wrong.
        </Alert>
      )}
      <fieldset className="space-y-4">
        <legend className="text-lg font-semibold text-walnut-900">Your workshop</legend>
        <TextField label="Workshop name" name="workshopName" autoComplete="organization" value={form.workshopName} onChange={(e) => set('workshopName', e.target.value)} error={errors.workshopName} />
        <SelectField label="Country" name="country" autoComplete="country" value={form.country} onChange={(e) => chooseCountry(e.target.value)} options={countryOptions} error={errors.country} hint="Suggests the currency, the tax and the measures; change any of them below." />
        <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
          <SelectField label="Currency" name="currency" value={form.currency} onChange={(e) => set('currency', e.target.value)} options={currencyOptions} error={errors.currency} />
          <SelectField
            label="Measures"
            name="units"
            value={form.units}
            onChange={(e) => set('units', e.target.value === 'imperial' ? 'imperial' : 'metric')}
            options={[
              { value: 'metric', label: 'Metric (mm, m², litres, grams)' },
              { value: 'imperial', label: 'Imperial (inches, ft², fl oz, oz)' },
            ]}
            error={errors.units}
          />
          <TextField label="Name of the tax" name="taxLabel" value={form.taxLabel} onChange={(e) => set('taxLabel', e.target.value)} error={errors.taxLabel} hint="As it prints on quotes: VAT, GST, Sales tax…" />
          <TextField label="Tax rate (%)" name="taxPct" inputMode="decimal" value={form.taxPct} onChange={(e) => set('taxPct', e.target.value)} error={errors.taxPct} hint="For example 20 for 20 %; 0 if you charge none." />
        </div>
        <label className="flex items-start gap-2 text-sm text-walnut-800">
          <input type="checkbox" name="pricesIncludeTax" checked={form.pricesIncludeTax} onChange={(e) => set('pricesIncludeTax', e.target.checked)} className="mt-0.5 h-4 w-4 accent-amber-600" />
          <span>Show prices to customers with the tax included</span>
        </label>
        <SelectField label="Time zone" name="timeZone" value={form.timeZone} onChange={(e) => set('timeZone', e.target.value)} options={zones.map((z) => ({ value: z, label: z.replace(/_/g, ' ') }))} error={errors.timeZone} hint="What “today” means for your quotes and the planning board." />
      </fieldset>
      <fieldset className="space-y-4">
        <legend className="text-lg font-semibold text-walnut-900">You, the owner</legend>
        <TextField label="Your name" name="ownerName" autoComplete="name" value={form.ownerName} onChange={(e) => set('ownerName', e.target.value)} error={errors.ownerName} />
        <TextField label="E-mail" type="email" name="email" autoComplete="email" value={form.email} onChange={(e) => set('email', e.target.value)} error={errors.email} hint="You sign in with it; we send a link to confirm it." />
        <TextField label="Password" type="password" name="new-password" autoComplete="new-password" value={form.password} onChange={(e) => set('password', e.target.value)} error={errors.password} hint="At least 10 characters. A few words you will remember make a good one." />
        <TextField label="The same password again" type="password" name="repeat-password" autoComplete="new-password" value={form.repeat} onChange={(e) => set('repeat', e.target.value)} error={errors.repeat} />
      </fieldset>
      <Button type="submit" className="w-full" busy={signUp.isPending}>
        Sign up the workshop
      </Button>
    </form>
  );
}
