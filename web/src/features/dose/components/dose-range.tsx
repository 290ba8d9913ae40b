import { oxidantDemandRange, oxidantQuantity } from '@shared/redox';
import type { DoseForm } from '@shared/schemas/dose';
import { Quantity } from '../../../components/ui/quantity';

const kg = (v: number) => v.toFixed(v < 10 ? 1 : 0);
const amount = (v: number) => (v < 10 ? v.toFixed(1) : v < 1000 ? v.toFixed(0) : (Math.round(v / 10) * 10).toFixed(0));

/**
 * The dose over the probe's tolerance: the present ratio is a probe estimate, ×/÷ the tolerance
 * factor, so the dose lies in a range around the central figure. Also what is actually handled:
 * litres of the chosen solution, or normal cubic metres of air or oxygen.
 */
export function DoseRange({ form, handledAs, uncertaintyFactor }: { form: DoseForm; handledAs: string; uncertaintyFactor: number | null }) {
  const range = oxidantDemandRange({ ...form, uncertaintyFactor: uncertaintyFactor ?? 1 });
  const handled = handledAs ? (kgOf: number) => oxidantQuantity({ oxidantKg: kgOf, oxidant: form.oxidant, form: handledAs }) : null;
  const central = handled?.(range.centralKg);
  return (
    <div className="flex flex-col gap-1" data-testid="dose-range">
      {uncertaintyFactor != null && uncertaintyFactor > 1 ? (
        <p>
          Range for the probe tolerance (ratio ×/÷ {uncertaintyFactor.toFixed(2)}):{' '}
          <Quantity value={`${kg(range.lowKg)} to ${kg(range.highKg)}`} unit="kg" className="font-semibold" />, central <Quantity value={kg(range.centralKg)} unit="kg" />.
        </p>
      ) : (
        <p className="text-ink-muted">No probe tolerance is known for this tank, so no range is shown.</p>
      )}
      {central && handled && (
        <p data-testid="dose-handled">
          As {central.form.label}: about <Quantity value={amount(central.amount)} unit={central.unit} className="text-xl font-semibold" />
          {uncertaintyFactor != null && uncertaintyFactor > 1 && (
            <> (<Quantity value={`${amount(handled(range.lowKg).amount)} to ${amount(handled(range.highKg).amount)}`} unit={central.unit} />)</>
          )}
          {central.unit === 'Nm³' ? ' at 0 °C and 101.325 kPa' : ''}; {central.form.source}.
        </p>
      )}
    </div>
  );
}
