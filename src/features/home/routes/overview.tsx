import { Building2, CalendarDays, Flame, Scale } from 'lucide-react';
import { ROLE_DUTIES, ROLE_LABELS } from '@shared/schemas/auth';
import { WEEKDAYS } from '@shared/schemas/workshop';
import { Alert } from '@/components/alert';
import { Card, PageHeader } from '@/components/card';
import { Spinner } from '@/components/spinner';
import { useMe } from '@/lib/me';
import { useCan } from '@/lib/permissions';
import { useWorkshop } from '@/lib/workshop';
import { FirstRunChecklist } from '../components/first-run-checklist';
import { WhereToStart } from '../components/where-to-start';

const DAY_NAMES: Record<(typeof WEEKDAYS)[number], string> = {
  mon: 'Monday',
  tue: 'Tuesday',
  wed: 'Wednesday',
  thu: 'Thursday',
  fri: 'Friday',
  sat: 'Saturday',
  sun: 'Sunday',
};

export function OverviewPage() {
  const me = useMe();
  const workshop = useWorkshop();
  const can = useCan();
  const user = me.data!;
  return (
    <>
      <PageHeader title={`Good to see you, ${user.name.split(' ')[0]}`} description={`Signed in as ${ROLE_LABELS[user.role]}. ${ROLE_DUTIES[user.role]}`} />
      {can.editSettings && <FirstRunChecklist />}
      <WhereToStart userId={user.id} role={user.role} />
      {workshop.isPending && <Spinner />}
      {workshop.isError && <Alert tone="error" title="The workshop could not be loaded">{workshop.error.message}</Alert>}
      {workshop.data && (
        <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
          <Card title={<span className="inline-flex items-center gap-2"><Building2 className="h-4 w-4 text-amber-600" aria-hidden /> {workshop.data.name}</span>}>
            <dl className="grid grid-cols-[8rem_1fr] gap-y-2 text-sm">
              <dt className="text-walnut-500">Address</dt>
              <dd className="whitespace-pre-line">{workshop.data.address ?? '—'}</dd>
              <dt className="text-walnut-500">E-mail</dt>
              <dd>{workshop.data.email ?? '—'}</dd>
              <dt className="text-walnut-500">Telephone</dt>
              <dd>{workshop.data.phone ?? '—'}</dd>
            </dl>
          </Card>
          <Card title={<span className="inline-flex items-center gap-2"><Scale className="h-4 w-4 text-amber-600" aria-hidden /> Money and measures</span>}>
            <dl className="grid grid-cols-[8rem_1fr] gap-y-2 text-sm">
              <dt className="text-walnut-500">Currency</dt>
              <dd>{workshop.data.settings.pricing.currency}</dd>
              <dt className="text-walnut-500">Tax rate</dt>
              <dd className="num">{workshop.data.settings.pricing.taxPct} % {workshop.data.settings.pricing.taxLabel}</dd>
              <dt className="text-walnut-500">Display units</dt>
              <dd>{workshop.data.settings.units === 'metric' ? 'Metric (mm, m², L, g)' : 'Imperial (in, ft², fl oz, oz)'}</dd>
            </dl>
          </Card>
          <Card title={<span className="inline-flex items-center gap-2"><CalendarDays className="h-4 w-4 text-amber-600" aria-hidden /> Working week</span>}>
            <table className="w-full text-sm">
              <caption className="sr-only">Opening hours</caption>
              <tbody className="divide-y divide-parchment-200">
                {WEEKDAYS.map((day) => {
                  const hours = workshop.data.settings.calendar.workingWeek.find((d) => d.day === day);
                  return (
                    <tr key={day}>
                      <th scope="row" className="py-1.5 text-left font-normal text-walnut-600">{DAY_NAMES[day]}</th>
                      <td className="num py-1.5 text-right">{hours ? `${hours.open}–${hours.close}` : 'closed'}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
            {workshop.data.settings.calendar.closedDates.length > 0 && (
              <p className="mt-3 text-xs text-walnut-500">Closed dates: {workshop.data.settings.calendar.closedDates.join(', ')}</p>
            )}
          </Card>
          <Card title={<span className="inline-flex items-center gap-2"><Flame className="h-4 w-4 text-brick-600" aria-hidden /> In the polishing room</span>}>
            <ul className="list-disc space-y-1.5 pl-5 text-sm text-walnut-700">
              <li>Spirit vapour is flammable: no flames, sparks or heaters near open polish.</li>
              <li>Oily rags can heat and ignite by themselves: spread them flat to dry, or keep them in a closed metal can of water.</li>
              <li>Methylated spirit may contain methanol, which is toxic: ventilate, wear gloves and eye protection.</li>
              <li>Local fire codes, the workplace-safety regulator and licensed practice come first.</li>
            </ul>
          </Card>
        </div>
      )}
    </>
  );
}
