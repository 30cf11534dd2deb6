import { Check } from 'lucide-react';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { useMaterials } from '@/lib/materials';
import { useLabourRates, useSaveSettings, useSettings } from '../api/settings';
import { CardPaymentsCard } from '../components/card-payments';
import { LabourRatesCard } from '../components/labour-rates';
import { SettingsForm } from '../components/settings-form';

export function SettingsPage() {
  const settings = useSettings();
  const rates = useLabourRates();
  const materials = useMaterials({ pageSize: 100, sort: 'name' });
  const save = useSaveSettings();
  return (
    <>
      <PageHeader
        title="Settings"
        description="Rates, money, the working week and the rooms: everything the estimator and the quotes read besides the price list. Each change is kept in the audit log."
        actions={
          settings.data && (
            <Button type="submit" form="settings-form" busy={save.isPending}>
              <Check className="h-4 w-4" aria-hidden /> Save settings
            </Button>
          )
        }
      />
      {settings.isPending && <Spinner label="Loading the settings…" />}
      {settings.isError && <Alert tone="error" title="Settings could not be loaded">{settings.error.message}</Alert>}
      {settings.data && (
        <div className="space-y-6">
          <CardPaymentsCard />
          <LabourRatesCard currency={settings.data.settings.pricing.currency} />
          <SettingsForm
            workshop={settings.data}
            materials={materials.data?.rows ?? []}
            rateOptions={(rates.data ?? []).map((r) => ({ value: r.key, label: `${r.name} (${r.key})` }))}
            saving={save.isPending}
            onSave={(input) => save.mutateAsync(input)}
          />
        </div>
      )}
    </>
  );
}

export const Component = SettingsPage;
