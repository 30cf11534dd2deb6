/** Sending a purchase order to its supplier, and receiving it: what came, at what price. */
import { useState } from 'react';
import { ReceiveOrderSchema, SendOrderSchema, type PurchaseOrderDto } from '@shared/schemas/stock';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { TextField } from '@/components/field';
import { formatMoney, todayIso } from '@/lib/format';
import { serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useReceiveOrder, useSendOrder } from '../api/stock';

function addDays(date: string, n: number): string {
  const d = new Date(`${date}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + n);
  return d.toISOString().slice(0, 10);
}

export function SendOrderDialog({ order, onClose }: { order: PurchaseOrderDto; onClose: () => void }) {
  const [to, setTo] = useState(order.sentTo ?? '');
  const [expectedOn, setExpectedOn] = useState(order.expectedOn ?? addDays(todayIso(), 7));
  const [message, setMessage] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const send = useSendOrder();
  return (
    <Dialog title={`Send ${order.number} to ${order.supplier}`} open onClose={onClose}>
      <form
        className="space-y-3"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          const parsed = SendOrderSchema.safeParse({ to, expectedOn, message });
          if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
          setErrors({});
          send.mutate({ id: order.id, ...parsed.data }, { onSuccess: onClose, onError: (err) => setErrors(serverFieldErrors(err)) });
        }}
      >
        <TextField label="Supplier's e-mail" type="email" value={to} onChange={(e) => setTo(e.target.value)} error={errors.to} />
        <TextField label="Wanted by" type="date" value={expectedOn} onChange={(e) => setExpectedOn(e.target.value)} error={errors.expectedOn} hint="Low-stock warnings count what the jobs need until this day." />
        <label className="flex flex-col gap-1 text-sm font-medium text-walnut-800">
          Covering message (optional)
          <textarea className="min-h-24 rounded-md border border-walnut-200 px-3 py-2 text-sm font-normal" value={message} onChange={(e) => setMessage(e.target.value)} maxLength={4000} />
        </label>
        <p className="text-xs text-walnut-500">The order goes as a PDF through the outbox: {order.lines.length} line{order.lines.length === 1 ? '' : 's'}, {formatMoney(order.total, order.currency)} at our listed prices.</p>
        {send.isError && Object.keys(serverFieldErrors(send.error)).length === 0 && <Alert tone="error" title="The order was not sent">{send.error.message}</Alert>}
        <div className="flex justify-end gap-2">
          <Button type="button" variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={send.isPending}>
            Send the order
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

export function ReceiveOrderDialog({ order, onClose }: { order: PurchaseOrderDto; onClose: () => void }) {
  const [receivedOn, setReceivedOn] = useState(todayIso());
  const [recordPrices, setRecordPrices] = useState(true);
  const [lines, setLines] = useState(order.lines.map((l) => ({ lineId: l.id, packs: String(l.packs), paidPrice: l.packPrice })));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const receive = useReceiveOrder();
  const set = (i: number, patch: Partial<(typeof lines)[number]>) => setLines((ls) => ls.map((l, j) => (j === i ? { ...l, ...patch } : l)));
  return (
    <Dialog title={`Receive ${order.number}`} open onClose={onClose} wide>
      <form
        className="space-y-3"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          const body = { receivedOn, recordPrices, lines: lines.map((l) => ({ lineId: l.lineId, packs: l.packs === '' ? undefined : Number(l.packs), paidPrice: l.paidPrice })) };
          const parsed = ReceiveOrderSchema.safeParse(body);
          if (!parsed.success) return setErrors(zodFieldErrors(parsed.error));
          setErrors({});
          receive.mutate({ id: order.id, ...parsed.data }, { onSuccess: onClose, onError: (err) => setErrors(serverFieldErrors(err)) });
        }}
      >
        <TextField label="Received on" type="date" value={receivedOn} onChange={(e) => setReceivedOn(e.target.value)} error={errors.receivedOn} />
        <div className="overflow-x-auto">
          <table className="min-w-full text-sm">
            <caption className="sr-only">What came in, line by line</caption>
            <thead className="bg-parchment-100 text-left text-xs tracking-wide text-walnut-600 uppercase">
              <tr>
                <th scope="col" className="px-2 py-2">Material</th>
                <th scope="col" className="px-2 py-2 text-right">Ordered</th>
                <th scope="col" className="px-2 py-2">Packs received</th>
                <th scope="col" className="px-2 py-2">Paid a pack ({order.currency})</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-parchment-200">
              {order.lines.map((l, i) => (
                <tr key={l.id}>
                  <td className="px-2 py-2">
                    {l.material} <span className="text-xs text-walnut-500">({l.packLabel})</span>
                  </td>
                  <td className="num px-2 py-2 text-right">{l.packs}</td>
                  <td className="px-2 py-2">
                    <input type="number" min="0" step="1" aria-label={`Packs of ${l.material} received`} aria-invalid={errors[`lines.${i}.packs`] ? true : undefined} className="num w-20 rounded-md border border-walnut-200 px-2 py-1 text-right" value={lines[i]!.packs} onChange={(e) => set(i, { packs: e.target.value })} />
                    {errors[`lines.${i}.packs`] && <p className="text-xs text-brick-700">▲ Packs {errors[`lines.${i}.packs`]}</p>}
                  </td>
                  <td className="px-2 py-2">
                    <input inputMode="decimal" aria-label={`Price paid a pack of ${l.material}`} aria-invalid={errors[`lines.${i}.paidPrice`] ? true : undefined} className="num w-24 rounded-md border border-walnut-200 px-2 py-1 text-right" value={lines[i]!.paidPrice} onChange={(e) => set(i, { paidPrice: e.target.value })} />
                    {errors[`lines.${i}.paidPrice`] && <p className="text-xs text-brick-700">▲ Price {errors[`lines.${i}.paidPrice`]}</p>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        <label className="flex items-center gap-2 text-sm text-walnut-800">
          <input type="checkbox" checked={recordPrices} onChange={(e) => setRecordPrices(e.target.checked)} />
          Record each price paid as the pack&rsquo;s price from this day
        </label>
        {receive.isError && Object.keys(serverFieldErrors(receive.error)).length === 0 && <Alert tone="error" title="The order was not received">{receive.error.message}</Alert>}
        <div className="flex justify-end gap-2">
          <Button type="button" variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" busy={receive.isPending}>
            Add to stock
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
